import fc from 'fast-check';
import { describe, expect, it } from 'vitest';
import { covarianceEllipse, ellipseScale, median } from '../../app/model/dispersion';
import { FallTable } from '../../app/model/fall-table';
import {
  fixedHeadingProgramme,
  flySamples,
  passiveOffset,
  reachRadius,
  type FlightSetup,
} from '../../app/model/flight';
import { naiveFlight } from '../../app/model/naive-integrator';
import { planDrop } from '../../app/planner/planner';
import { Rng } from '../../app/model/rng';
import { WindProfile } from '../../app/model/wind';
import { RELEASE, expectClose, geodesicDistance_m, makePlan, offsetLatLng } from './helpers';

const DEG = Math.PI / 180;
const NO_ERROR = {
  windSpeed_mps: 0,
  windCorrelation_m: 300,
  descentRate_pct: 0,
  releasePosition_m: 0,
  heading_deg: 0,
  releaseTiming_s: 0,
};

describe('confidence ellipse scale', () => {
  // Hoover 1984, "Algorithms for Confidence Circles and Ellipses", NOAA TR NOS 107:
  // k = √(−2 ln(1−P)), printed to 4 decimals.
  for (const [p, k] of [
    [0.5, 1.1774],
    [0.9, 2.146],
    [0.95, 2.4477],
    [0.99, 3.0349],
  ]) {
    it(`ellipseScale(${p}) is ${k} (Hoover 1984)`, () => {
      expectClose(ellipseScale(p), k, 0.00005, `k(${p})`);
    });
  }
});

describe('covariance ellipse', () => {
  it('an axis-aligned covariance diag(9, 4) gives semi-axes 3k and 2k with the major axis east', () => {
    const e = covarianceEllipse({ x: 1, y: 2 }, [9, 0, 4], 0.95);
    expectClose(e.semiMajor_m, 3 * 2.4477, 0.0002, 'major');
    expectClose(e.semiMinor_m, 2 * 2.4477, 0.0002, 'minor');
    expectClose(e.azimuth_deg, 90, 1e-9, 'azimuth');
    expect(e.center).toEqual({ x: 1, y: 2 });
  });

  it('a north-elongated covariance has azimuth 0', () => {
    const e = covarianceEllipse({ x: 0, y: 0 }, [1, 0, 16], 0.5);
    expectClose(e.semiMajor_m, 4 * 1.1774, 0.0002, 'major');
    expectClose(e.azimuth_deg % 180, 0, 1e-9, 'azimuth');
  });

  // Closed form: Σ = a² u uᵀ + b² v vᵀ with u the unit vector at azimuth θ (x east, y north)
  // and v ⊥ u has semi-axes k·a, k·b and major-axis azimuth θ (mod 180°).
  it('recovers the axes and azimuth of a rotated ellipse built from its eigenvectors', () => {
    fc.assert(
      fc.property(
        fc.double({ min: 0.5, max: 50, noNaN: true }),
        fc.double({ min: 0.05, max: 0.9, noNaN: true }),
        fc.double({ min: 0, max: 179.9, noNaN: true }),
        (a, ratio, az) => {
          const b = a * ratio;
          const u = { x: Math.sin(az * DEG), y: Math.cos(az * DEG) };
          const v = { x: u.y, y: -u.x };
          const cov = [
            a * a * u.x * u.x + b * b * v.x * v.x,
            a * a * u.x * u.y + b * b * v.x * v.y,
            a * a * u.y * u.y + b * b * v.y * v.y,
          ];
          const k = ellipseScale(0.95);
          const e = covarianceEllipse({ x: 0, y: 0 }, cov, 0.95);
          expectClose(e.semiMajor_m, k * a, 1e-9 * k * a, 'major');
          expectClose(e.semiMinor_m, k * b, 1e-7 * k * a, 'minor');
          const dAz = ((((e.azimuth_deg - az) % 180) + 270) % 180) - 90;
          expectClose(dAz, 0, 1e-6, 'azimuth');
          expect(e.azimuth_deg).toBeGreaterThanOrEqual(0);
          expect(e.azimuth_deg).toBeLessThan(180);
        },
      ),
      { numRuns: 100 },
    );
  });

  it('a covariance along azimuth 30° reports 30° and one along 150° reports 150°', () => {
    for (const az of [30, 150]) {
      const u = { x: Math.sin(az * DEG), y: Math.cos(az * DEG) };
      const e = covarianceEllipse({ x: 0, y: 0 }, [u.x * u.x, u.x * u.y, u.y * u.y], 0.5);
      expectClose(e.azimuth_deg, az, 1e-9, `azimuth ${az}`);
      expectClose(e.semiMinor_m, 0, 1e-7, 'minor of a degenerate ellipse');
    }
  });
});

describe('Monte Carlo of a circular-normal passive drop', () => {
  // Only release-position error σ per axis, calm air, hovering carrier: landings are the release
  // point plus N(0, σ²I), i.e. circular normal about the site directly below.
  const sigma = 4;
  const n = 20000;
  const plan = makePlan({
    sites: [
      { id: 'r1', lat: RELEASE.lat, lon: RELEASE.lon, tolerance_m: sigma },
      { id: 'r2', lat: RELEASE.lat, lon: RELEASE.lon, tolerance_m: 2 * sigma },
    ],
    uncertainty: { releasePosition_m: sigma },
    monteCarlo: { samples: n, seed: 11 },
  });
  const result = planDrop(plan);

  // Rayleigh (docs/references.md): P(r < R) = 1 − exp(−R²/2σ²). A proportion's standard error is
  // √(p(1−p)/n); 4 standard errors (two-sided 6e-5) is the tolerance: 0.014 at n = 20000.
  for (const [i, R] of [
    [0, sigma],
    [1, 2 * sigma],
  ]) {
    it(`P(hit within ${R / sigma}σ) ≈ 1 − exp(−R²/2σ²) (Rayleigh)`, () => {
      const p = 1 - Math.exp(-(R * R) / (2 * sigma * sigma));
      expectClose(result.sites[i].pHit, p, 4 * Math.sqrt((p * (1 - p)) / n), 'P(hit)');
    });
  }

  // CEP = √(2 ln 2)·σ = 1.1774σ (docs/references.md). Standard error of a sample median:
  // 1/(2 f(m) √n) with the Rayleigh density f(m) = (m/σ²)·exp(−m²/2σ²) = 0.5887/σ at the median,
  // i.e. 0.849σ/√n; tolerance 4 standard errors (0.024σ at n = 20000).
  it('CEP ≈ 1.1774σ (circular normal)', () => {
    const m = 1.1774 * sigma;
    const f = (m / sigma ** 2) * Math.exp(-(m * m) / (2 * sigma ** 2));
    const se = 1 / (2 * f * Math.sqrt(n));
    for (const s of result.sites) expectClose(s.cep_m, m, 4 * se, `CEP ${s.id}`);
  });

  // Ellipse semi-axes k·√λ with λ the sample-covariance eigenvalues (avg ± r). For isotropic σ²:
  // SD(avg) = σ²/√n and r is Rayleigh with scale σ²/√n, so |λ/σ² − 1| ≤ 8/√n with probability
  // > 0.999 and the semi-axes are within 4/√n (relative) of kσ: 2.8 % at n = 20000.
  it('the 95 % ellipse semi-axes are ≈ 2.4477σ and the 50 % ones ≈ 1.1774σ (Hoover 1984)', () => {
    const rel = 4 / Math.sqrt(n);
    for (const s of result.sites) {
      for (const [e, k] of [
        [s.ellipse95, 2.4477],
        [s.ellipse50, 1.1774],
      ] as const) {
        expectClose(e.semiMajor_m, k * sigma, rel * k * sigma, `${s.id} major`);
        expectClose(e.semiMinor_m, k * sigma, rel * k * sigma, `${s.id} minor`);
      }
    }
  });

  // The sample mean has standard error σ/√n per axis; 4 SE per axis → 4√2 σ/√n in distance.
  it('the mean landing is the release point within 4√2·σ/√n', () => {
    for (const s of result.sites) {
      expect(geodesicDistance_m(s.meanLanding, RELEASE)).toBeLessThanOrEqual(
        (4 * Math.SQRT2 * sigma) / Math.sqrt(n),
      );
    }
  });
});

describe('zero-uncertainty Monte Carlo equals the deterministic answer', () => {
  const layers = [
    { altitude_m: 10, fromDeg: 250, speed_mps: 3 },
    { altitude_m: 120, fromDeg: 280, speed_mps: 8 },
  ];
  const wind = new WindProfile(layers, { reference: 'AGL', groundElevation_m: 40 });
  const table = new FallTable({
    top_m: 190,
    bottom_m: 42,
    descentRateSL_mps: 2.9,
    entryLoss_m: 6,
    isaOffset_K: 7,
    wind,
  });
  const wt = wind.at(190);
  const setup = (guidance: 'passive' | 'fixed-heading'): FlightSetup => ({
    table,
    guidance,
    cotGamma: guidance === 'passive' ? 0 : 1 / Math.tan(42 * DEG),
    controlTime_s: guidance === 'passive' ? 0 : 25,
    carrier: { x: 7, y: -7 },
    windTop: { x: wt.east_mps, y: wt.north_mps },
  });
  const request = (
    n: number,
    site = { x: 40, y: 10 },
    programme?: { headingTrue_deg: number; thrust_s: number },
  ) => ({
    n,
    rng: new Rng(3),
    uncertainty: NO_ERROR,
    release: { x: 12, y: -30 },
    trackUnit: { x: Math.SQRT1_2, y: -Math.SQRT1_2 },
    groundSpeed_mps: 9.9,
    site,
    programme,
  });

  it('every passive sample lands at release + passiveOffset', () => {
    const s = setup('passive');
    const xs = new Float64Array(50);
    const ys = new Float64Array(50);
    flySamples(s, request(50), xs, ys);
    const off = passiveOffset(s);
    for (let i = 0; i < 50; i++) {
      expectClose(xs[i], 12 + off.x, 1e-9, 'x');
      expectClose(ys[i], -30 + off.y, 1e-9, 'y');
    }
  });

  it('every fixed-heading sample lands where naiveFlight flies the same programme', () => {
    const s = setup('fixed-heading');
    const off = passiveOffset(s);
    // Site 25 m east and 10 m south of the uncontrolled landing: inside the reach.
    const site = { x: 12 + off.x + 25, y: -30 + off.y - 10 };
    const prog = fixedHeadingProgramme(s, { x: 25, y: -10 });
    const xs = new Float64Array(20);
    const ys = new Float64Array(20);
    flySamples(s, request(20, site, prog), xs, ys);
    const ref = naiveFlight({
      top_m: 190,
      bottom_m: 42,
      descentRateSL_mps: 2.9,
      entryLoss_m: 6,
      isaOffset_K: 7,
      wind,
      carrier: { x: 7, y: -7 },
      cotGamma: s.cotGamma,
      headingTrue_deg: prog.headingTrue_deg,
      thrust_s: prog.thrust_s,
    });
    for (let i = 0; i < 20; i++) {
      expect(xs[i]).toBe(xs[0]);
      expect(ys[i]).toBe(ys[0]);
    }
    // 0.1 m: the accuracy of naiveFlight's 10 ms steps (see descent.test.ts).
    expectClose(xs[0], 12 + ref.x, 0.1, 'x');
    expectClose(ys[0], -30 + ref.y, 0.1, 'y');
    // The site is inside the reach here, so the programme lands on it.
    expect(Math.hypot(25, 10)).toBeLessThan(reachRadius(s));
    expectClose(Math.hypot(xs[0] - site.x, ys[0] - site.y), 0, 1e-6, 'miss');
  });

  it('planDrop with no uncertainty gives zero-size ellipses, P(hit) 0 or 1 and CEP = the miss', () => {
    const planWith = (site: { lat: number; lon: number }) =>
      makePlan({
        groundElevation_m: 40,
        winds: { reference: 'AGL', layers },
        release: { ...RELEASE, altitude_m: 150, reference: 'AGL' },
        variants: [
          { id: 'p', guidance: 'passive', descentRate_mps: 3 },
          {
            id: 'f',
            guidance: 'fixed-heading',
            descentRate_mps: 2.8,
            glideAngle_deg: 45,
            controlTime_s: 20,
            entryLoss_m: 8,
          },
        ],
        sites: [{ id: 'a', ...site, tolerance_m: 10 }],
        // Still air: no modelled gusts or vertical air either.
        uncertainty: { turbulence: 'none' },
        monteCarlo: { samples: 64, seed: 5 },
      });
    // Hovering: the passive landing does not depend on the site, so place the site 30 m east and
    // 12 m south of it (inside the fixed-heading reach, outside the 10 m tolerance).
    const landing = planDrop(planWith(RELEASE)).sites[0].byVariant[0].nominalLanding;
    const plan = planWith(offsetLatLng(landing, 30, -12));
    const site = plan.sites[0];
    const r = planDrop(plan).sites[0];
    for (const v of r.byVariant) {
      for (const e of [v.ellipse50, v.ellipse95, v.ellipse99]) {
        expect(e.semiMajor_m).toBeLessThan(1e-6);
        expect(e.semiMinor_m).toBeLessThan(1e-6);
      }
      expect([0, 1]).toContain(v.pHit);
      expect(geodesicDistance_m(v.meanLanding, v.ellipse95.center)).toBeLessThan(1e-6);
    }
    const [passive, fixed] = r.byVariant;
    // Passive: every sample is the nominal landing, so the median miss is the nominal miss.
    expectClose(passive.cep_m, passive.nominalMiss_m, 1e-6, 'passive CEP');
    expectClose(passive.cep_m, geodesicDistance_m(passive.nominalLanding, site), 0.001, 'miss');
    expect(geodesicDistance_m(passive.meanLanding, passive.nominalLanding)).toBeLessThan(0.001);
    expect(passive.pHit).toBe(passive.nominalMiss_m <= 10 ? 1 : 0);
    // Fixed-heading: the site is within reach, so its programme lands on it.
    expect(passive.nominalMiss_m).toBeLessThan(fixed.reachRadius_m);
    expect(fixed.cep_m).toBeLessThan(1e-6);
    expect(fixed.pHit).toBe(1);
  });
});

describe('seeded Monte Carlo', () => {
  const plan = (seed: number) =>
    makePlan({
      winds: { reference: 'AGL', layers: [{ altitude_m: 50, fromDeg: 200, speed_mps: 6 }] },
      uncertainty: { windSpeed_mps: 1, releasePosition_m: 2, descentRate_pct: 5 },
      monteCarlo: { samples: 300, seed },
    });

  it('the same seed gives identical results', () => {
    expect(planDrop(plan(42))).toEqual(planDrop(plan(42)));
  });

  it('a different seed gives different results', () => {
    const a = planDrop(plan(42)).sites[0];
    const b = planDrop(plan(43)).sites[0];
    expect(a.cep_m).not.toBe(b.cep_m);
    expect(a.ellipse95.semiMajor_m).not.toBe(b.ellipse95.semiMajor_m);
  });
});

describe('median by quickselect', () => {
  it('equals the middle of the sorted values (definition), for odd and even counts', () => {
    fc.assert(
      fc.property(
        fc.array(fc.double({ min: -1e6, max: 1e6, noNaN: true }), { minLength: 1, maxLength: 60 }),
        (xs) => {
          const sorted = [...xs].sort((a, b) => a - b);
          const n = xs.length;
          const want = n % 2 ? sorted[(n - 1) / 2] : (sorted[n / 2 - 1] + sorted[n / 2]) / 2;
          expect(median(Float64Array.from(xs))).toBe(want);
        },
      ),
      { numRuns: 300 },
    );
  });
});
