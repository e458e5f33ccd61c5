import { readFileSync } from 'node:fs';
import { describe, expect, it } from 'vitest';
import { FallTable } from '../../app/model/fall-table';
import { type FlightSetup, flySamples, passiveOffset } from '../../app/model/flight';
import {
  bestShift,
  CLASS_W20_MPS,
  classW20,
  fallTurbulence,
  hashLabel,
  hitProfile,
  lowAltitudeTurbulence,
  profileAt,
  Rng,
  streamSeed,
  type Uncertainty,
} from '../../app/model';
import { WindProfile } from '../../app/model/wind';
import type { Plan, PlanFile } from '../../app/plan/plan';
import { resolvePlan } from '../../app/plan/plan-defaults';
import { validatePlan } from '../../app/plan/validate';
import { errorSources } from '../../app/planner/error-sources';
import { planDrop } from '../../app/planner/planner';
import demo from '../../data/demo-plan.json';
import { makeField } from '../support/make-field';
import { NOW, RELEASE, expectClose, makePlan, offsetLatLng } from './helpers';

// International foot (1959) and knot (1852 m per hour): exact definitions.
const FT = 0.3048;
const KT = 1852 / 3600;

const STILL: Uncertainty = {
  windSpeed_mps: 0,
  windCorrelation_m: 300,
  descentRate_pct: 0,
  releasePosition_m: 0,
  heading_deg: 0,
  releaseTiming_s: 0,
  turbulence: 'none',
};

// ---------------------------------------------------------------------------------------------
// Independent reference helpers

/** Air density (kg/m³) of the U.S. Standard Atmosphere 1976 troposphere at geometric height z (m). */
function isaDensity(z: number): number {
  // USSA 1976: r0 = 6356766 m, T0 = 288.15 K, L = −6.5 K/km, ρ0 = 1.225 kg/m³,
  // g0·M0/(R*·L) = 9.80665 · 0.0289644 / (8.31432 · 0.0065).
  const h = (6356766 * z) / (6356766 + z);
  const t = 288.15 - 0.0065 * h;
  const n = (9.80665 * 0.0289644) / (8.31432 * 0.0065);
  return 1.225 * (t / 288.15) ** (n - 1);
}

/** ∫_a^b f by composite Simpson with m (even) intervals. */
function simpson(f: (x: number) => number, a: number, b: number, m = 2000): number {
  const h = (b - a) / m;
  let s = f(a) + f(b);
  for (let i = 1; i < m; i++) s += (i % 2 ? 4 : 2) * f(a + i * h);
  return (s * h) / 3;
}

/** Descent speed (m/s) at z of a body descending at wSL in sea-level air: w = wSL·√(ρ0/ρ). */
const descentAt = (wSL: number, z: number) => wSL * Math.sqrt(1.225 / isaDensity(z));

/** Fall time (s) from top to bottom with an updraft a (m/s): ∫ dz / (w(z) − a), by hand. */
const fallTime = (wSL: number, top: number, bottom: number, a = 0) =>
  simpson((z) => 1 / (descentAt(wSL, z) - a), bottom, top);

/** Landing variance per component of an integrated Ornstein–Uhlenbeck gust (σ, τ) over T. */
const ouVariance = (sigma: number, tau: number, T: number) =>
  sigma * sigma * 2 * tau * tau * (T / tau - 1 + Math.exp(-T / tau));

/** Standard normal CDF via Numerical Recipes' erfc (Chebyshev fit, |ε| < 1.2e-7). */
function normalCdf(x: number): number {
  const z = Math.abs(x) / Math.SQRT2;
  const t = 1 / (1 + 0.5 * z);
  const erfc =
    t *
    Math.exp(
      -z * z -
        1.26551223 +
        t *
          (1.00002368 +
            t *
              (0.37409196 +
                t *
                  (0.09678418 +
                    t *
                      (-0.18628806 +
                        t *
                          (0.27886807 +
                            t *
                              (-1.13520398 +
                                t * (1.48851587 + t * (-0.82215223 + t * 0.17087277)))))))),
    );
  return x >= 0 ? 1 - erfc / 2 : erfc / 2;
}

/** Inverse of normalCdf by bisection (to 1e-10). */
function normalQuantile(q: number): number {
  let lo = -10;
  let hi = 10;
  while (hi - lo > 1e-10) {
    const mid = (lo + hi) / 2;
    if (normalCdf(mid) < q) lo = mid;
    else hi = mid;
  }
  return (lo + hi) / 2;
}

/** Sample variance about the sample mean. */
function variance(a: Float64Array): number {
  let m = 0;
  for (const v of a) m += v;
  m /= a.length;
  let s = 0;
  for (const v of a) s += (v - m) * (v - m);
  return s / (a.length - 1);
}

/** A passive setup of a table in a uniform wind, released at rest, with no forward throw. */
function passiveSetup(table: FallTable, windTop: { x: number; y: number }): FlightSetup {
  return {
    table,
    guidance: 'passive',
    cotGamma: 0,
    controlTime_s: 0,
    throwTime_s: 0,
    carrier: { x: 0, y: 0 },
    windTop,
  };
}

function fly(s: FlightSetup, n: number, seed: number, u: Uncertainty = STILL) {
  const xs = new Float64Array(n);
  const ys = new Float64Array(n);
  flySamples(
    s,
    {
      n,
      rng: new Rng(seed),
      uncertainty: u,
      release: { x: 0, y: 0 },
      trackUnit: { x: 1, y: 0 },
      groundSpeed_mps: 0,
      site: { x: 0, y: 0 },
    },
    xs,
    ys,
  );
  return { xs, ys };
}

// ---------------------------------------------------------------------------------------------

describe('low-altitude turbulence (MIL-F-8785C / MIL-HDBK-1797 low-altitude forms)', () => {
  // The standard's printed forms, in its own units (h in ft, W20 in kt), computed here:
  // σ_w = 0.1·W20; σ_u = σ_v = σ_w/(0.177 + 0.000823h)^0.4; L_w = h; L_u = L_v = h/(0.177 + 0.000823h)^1.2.
  const printed = (hFt: number, w20Kt: number) => {
    const k = 0.177 + 0.000823 * hFt;
    const sw = 0.1 * w20Kt;
    return { su: sw / k ** 0.4, sw, lu: hFt / k ** 1.2, lw: hFt };
  };

  for (const hFt of [10, 20, 50, 100, 300, 600, 999, 1000]) {
    for (const w20Kt of [15, 30, 45]) {
      it(`σ and length scales at ${hFt} ft for W20 = ${w20Kt} kt match the printed formulas`, () => {
        const m = lowAltitudeTurbulence(hFt * FT, w20Kt * KT);
        const p = printed(hFt, w20Kt);
        expectClose(m.sigmaU_mps / KT, p.su, 1e-12 * p.su, 'σ_u (kt)');
        expectClose(m.sigmaW_mps / KT, p.sw, 1e-12 * p.sw, 'σ_w (kt)');
        expectClose(m.lengthU_m / FT, p.lu, 1e-9 * p.lu, 'L_u (ft)');
        expectClose(m.lengthW_m / FT, p.lw, 1e-9 * p.lw, 'L_w (ft)');
      });
    }
  }

  it('below 10 ft the 10 ft values hold, above 1000 ft the 1000 ft values (the forms’ range)', () => {
    const w = 30 * KT;
    const at10 = printed(10, 30);
    const at1000 = printed(1000, 30);
    for (const hFt of [0, 1, 5, 9.99]) {
      const m = lowAltitudeTurbulence(hFt * FT, w);
      expectClose(m.sigmaU_mps / KT, at10.su, 1e-12, `σ_u at ${hFt} ft`);
      expectClose(m.lengthU_m / FT, at10.lu, 1e-9, `L_u at ${hFt} ft`);
      expectClose(m.lengthW_m / FT, 10, 1e-9, `L_w at ${hFt} ft`);
    }
    for (const hFt of [1000.01, 1500, 5000]) {
      const m = lowAltitudeTurbulence(hFt * FT, w);
      expectClose(m.sigmaU_mps / KT, at1000.su, 1e-12, `σ_u at ${hFt} ft`);
      expectClose(m.lengthU_m / FT, at1000.lu, 1e-9, `L_u at ${hFt} ft`);
      expectClose(m.lengthW_m / FT, 1000, 1e-9, `L_w at ${hFt} ft`);
    }
    // At 1000 ft the horizontal and vertical intensities meet (k = 1): σ_u = σ_w, L_u = L_w.
    const top = lowAltitudeTurbulence(1000 * FT, w);
    expectClose(top.sigmaU_mps, top.sigmaW_mps, 1e-12, 'σ_u = σ_w at 1000 ft');
  });

  it('the classes are W20 = 15, 30 and 45 kt; none is still air, auto the plan’s own wind', () => {
    // MIL-F-8785C low-altitude model: light, moderate, severe turbulence at W20 of 15, 30, 45 kt.
    expectClose(CLASS_W20_MPS.light, 15 * KT, 1e-12);
    expectClose(CLASS_W20_MPS.moderate, 30 * KT, 1e-12);
    expectClose(CLASS_W20_MPS.severe, 45 * KT, 1e-12);
    expect(classW20('none', 7)).toBe(0);
    expect(classW20('auto', 7)).toBe(7);
    expect(classW20('severe', 7)).toBe(CLASS_W20_MPS.severe);
  });
});

describe('passive landing under a Gauss–Markov gust (integrated Ornstein–Uhlenbeck variance)', () => {
  // Standard result: a stationary Gauss–Markov (OU) process of σ and correlation time τ, integrated
  // over T, has variance σ²·2τ²(T/τ − 1 + e^(−T/τ)). A passive vehicle in a uniform wind, thrown
  // nothing, drifts by that integral per component.
  const table = new FallTable({
    top_m: 100,
    bottom_m: 0,
    descentRateSL_mps: 3,
    entryLoss_m: 0,
    isaOffset_K: 0,
    wind: new WindProfile([]),
  });
  const T = table.fallTime_s;

  it('the fall table’s time is the hand integral ∫ dz / w(z) with the ISA density', () => {
    // Simpson on 2000 intervals of a smooth integrand: error far below 1e-9 s.
    expectClose(T, fallTime(3, 100, 0), 1e-6, 'fall time');
  });

  for (const [sigma, tau] of [
    [1, 0.1],
    [1, 0.5],
    [0.8, 4],
    [1.5, 33],
    [2, 600],
    [0.5, 3600],
  ]) {
    it(`fallTurbulence gives the exact variance for σ ${sigma} m/s, τ ${tau} s (T ≈ ${T.toFixed(1)} s)`, () => {
      const turb = fallTurbulence(table, 0, { w20_mps: 0, gust_mps: sigma, gustTime_s: tau });
      const v = ouVariance(sigma, tau, T);
      expectClose(turb.varA, v, 1e-9 * v, 'Var of the drift integral');
      // Standard result: Cov(∫_0^T g dt, g(0)) = σ²τ(1 − e^(−T/τ)).
      const c = sigma * sigma * tau * -Math.expm1(-T / tau);
      expectClose(turb.covAB, c, 1e-9 * c, 'Cov with the gust at release');
      expect(turb.sigma0_mps).toBe(sigma);
      expect(turb.verticalAir_mps).toBe(0);
    });
  }

  for (const [sigma, tau] of [
    [1, 0.5],
    [0.8, 4],
    [1.5, 33],
    [2, 600],
  ]) {
    it(`flySamples spreads the landings by σ²·2τ²(T/τ − 1 + e^(−T/τ)) for σ ${sigma}, τ ${tau} s`, () => {
      const s = {
        ...passiveSetup(table, { x: 0, y: 0 }),
        turbulence: fallTurbulence(table, 0, { w20_mps: 0, gust_mps: sigma, gustTime_s: tau }),
      };
      const n = 200_000;
      const { xs, ys } = fly(s, n, 11);
      const v = ouVariance(sigma, tau, T);
      // A sample variance of n normals has relative SE √(2/(n−1)); allow 5 SE (0.016 at n = 2·10⁵).
      const tol = 5 * Math.sqrt(2 / (n - 1)) * v;
      expectClose(variance(xs), v, tol, 'east variance');
      expectClose(variance(ys), v, tol, 'north variance');
    });
  }

  it('turbulence "none" with gust_mps 1 flies exactly that gust and nothing else (planDrop)', () => {
    const n = 100_000;
    const plan = makePlan({
      variants: [{ id: 'drifter', guidance: 'passive', descentRate_mps: 3, throwTime_s: 0 }],
      uncertainty: { turbulence: 'none', gust_mps: 1, gustTime_s: 5 },
      monteCarlo: { samples: n, seed: 21 },
    });
    const r = planDrop(plan).sites[0];
    const Tp = fallTime(3, 100, 0);
    expectClose(r.fallTime_s, Tp, 1e-6, 'fall time');
    const v = ouVariance(1, 5, Tp);
    // Hoover 1984: the P ellipse of a 2-D normal has semi-axes √λ·√(−2 ln(1 − P)).
    const k = Math.sqrt(-2 * Math.log(0.01));
    // Eigenvalues of a 2×2 sample covariance of two independent N(0, v) components: their mean
    // has relative SE √(1/n), their half-difference d = √(((s_xx − s_yy)/2)² + s_xy²) is Rayleigh
    // with scale v/√n (99.99 % quantile 4.3 v/√n). So |λ − v| ≤ (4 + 4.3)·v/√n; allow 9 v/√n.
    const tolLambda = (9 * v) / Math.sqrt(n);
    expectClose((r.ellipse99.semiMajor_m / k) ** 2, v, tolLambda, 'major axis variance');
    expectClose((r.ellipse99.semiMinor_m / k) ** 2, v, tolLambda, 'minor axis variance');
    // The effective values of this fall are reported as set, with no vertical air at all.
    expectClose(r.gust_mps, 1, 1e-12, 'reported gust');
    expectClose(r.gustTime_s, 5, 1e-12, 'reported correlation time');
    expect(r.verticalAir_mps).toBe(0);
  });
});

describe('vertical air (hand integral of fall time with w + w_air)', () => {
  // Passive vehicle in a uniform wind V, only a vertical air velocity a ~ N(0, σ_a²) constant
  // through each fall. The landing V·T(a), T(a) = ∫ dz / (w(z) − a), is monotone in a, so its
  // q-quantile is V·T(a_q) with a_q = σ_a·Φ⁻¹(q). T(a) is integrated here by hand (Simpson, USSA
  // 1976 density); the model's constant-factor form is exact only for uniform w, and w changes by
  // under 1 % over these 100 m, far less than the tolerance below.
  const V = 5;
  const wSL = 3;
  const sigmaA = 0.8;
  const wind = new WindProfile(
    [
      { altitude_m: 0, fromDeg: 270, speed_mps: V },
      { altitude_m: 500, fromDeg: 270, speed_mps: V },
    ],
    { reference: 'AGL', groundElevation_m: 0 },
  );
  const table = new FallTable({
    top_m: 100,
    bottom_m: 0,
    descentRateSL_mps: wSL,
    entryLoss_m: 0,
    isaOffset_K: 0,
    wind,
  });
  const n = 200_000;
  const s = {
    ...passiveSetup(table, { x: V, y: 0 }),
    turbulence: fallTurbulence(table, 0, { w20_mps: 0, verticalAir_mps: sigmaA }),
  };
  const { xs, ys } = fly(s, n, 5);
  const sorted = Float64Array.from(xs).sort();

  it('the still-air drift is V times the hand fall time (uniform wind)', () => {
    const off = passiveOffset(passiveSetup(table, { x: V, y: 0 }));
    expectClose(off.x, V * fallTime(wSL, 100, 0), 1e-4, 'drift east');
    expectClose(off.y, 0, 1e-9, 'drift north');
    // Vertical air moves the landing along the wind only.
    for (let i = 0; i < 100; i++) expectClose(ys[i], 0, 1e-9, 'north');
  });

  for (const q of [0.16, 0.5, 0.84]) {
    it(`the ${q} quantile of the landing is V·T(σ_a·Φ⁻¹(${q}))`, () => {
      const aq = sigmaA * normalQuantile(q);
      const expected = V * fallTime(wSL, 100, 0, aq);
      // Quantile SE ≈ √(q(1−q)/n)/pdf(x_q), with pdf(x_q) = φ(z_q) / (σ_a·V·T'(a_q)) and
      // T'(a) = ∫ dz / (w − a)²; allow 5 SE.
      const dT = simpson((z) => (descentAt(wSL, z) - aq) ** -2, 0, 100);
      const zq = aq / sigmaA;
      const pdf = Math.exp((-zq * zq) / 2) / Math.sqrt(2 * Math.PI) / (sigmaA * V * dT);
      const se = Math.sqrt((q * (1 - q)) / n) / pdf;
      expectClose(sorted[Math.floor(q * n)], expected, 5 * se, `quantile ${q}`);
    });
  }

  it('an updraft lengthens the fall: the spread is skewed downwind as the integral says', () => {
    // V·(T(+σ) − T(0)) > V·(T(0) − T(−σ)) because 1/(w − a) is convex in a.
    const up = V * (fallTime(wSL, 100, 0, sigmaA) - fallTime(wSL, 100, 0));
    const down = V * (fallTime(wSL, 100, 0) - fallTime(wSL, 100, 0, -sigmaA));
    expect(up).toBeGreaterThan(down * 1.1);
    const hi = sorted[Math.floor(0.84 * n)] - sorted[Math.floor(0.5 * n)];
    const lo = sorted[Math.floor(0.5 * n)] - sorted[Math.floor(0.16 * n)];
    expect(hi).toBeGreaterThan(lo * 1.1);
  });
});

describe('P(hit) after the window choice (Rayleigh distribution)', () => {
  // Circular-normal landing of σ per axis about the site: P(miss ≤ r) = 1 − exp(−r²/2σ²)
  // (Rayleigh distribution; docs/references.md). Only the release position errs.
  const sigma = 5;
  const tol = 5;
  const rayleigh = 1 - Math.exp(-(tol * tol) / (2 * sigma * sigma));
  const speed = 10;
  const track = 30;
  const fileFor = (seed: number, site: { lat: number; lon: number }): Partial<PlanFile> => ({
    winds: { reference: 'AGL', layers: [{ altitude_m: 50, fromDeg: 250, speed_mps: 5 }] },
    carrier: { groundSpeed_mps: speed, trackDeg: track },
    sites: [{ id: 's', ...site, tolerance_m: tol }],
    uncertainty: { releasePosition_m: sigma, turbulence: 'none' },
    monteCarlo: { samples: 200, seed },
    // Low enough that every seed has a window, so its best time is reported.
    requiredPHit: 0.01,
  });
  const planFor = (seed: number, site: { lat: number; lon: number }) =>
    makePlan(fileFor(seed, site));
  // Site at the uncontrolled landing of the plan's release point.
  const landing = planDrop(planFor(1, RELEASE)).sites[0].nominalLanding;
  const seeds = Array.from({ length: 60 }, (_, i) => i + 1);
  const n = 200;
  // SE of the mean of 60 independent shares of 200: √(p(1−p)/(60·200)) = 0.0045.
  const seMean = Math.sqrt((rayleigh * (1 - rayleigh)) / (seeds.length * n));
  const runs = seeds.map((seed) => planDrop(planFor(seed, landing)).sites[0]);

  // The release chosen on 200 other samples sits a little off the ideal one, which costs a few
  // thousandths below Rayleigh (about 1.7 SE on these seeds); the Rice check below accounts for it.
  it('the reported P(hit), averaged over 60 seeds of 200 samples, is within 3 SE of Rayleigh', () => {
    const mean = runs.reduce((a, r) => a + r.pHit, 0) / runs.length;
    expectClose(mean, rayleigh, 3 * seMean, 'mean reported P(hit)');
    for (const r of runs) {
      expect(r.releaseWindow).not.toBeNull();
      expectClose(r.pHitSE, Math.sqrt((r.pHit * (1 - r.pHit)) / n), 1e-12, 'pHitSE');
    }
  });

  it('the reported P(hit) is unbiased for the release actually chosen (Rice distribution)', () => {
    // The release time is chosen on other samples, so it sits a little off the ideal one, by
    // d = the nominal miss of the chosen release; the hit probability there is the Rice CDF
    // P(d) = ∫_0^r (ρ/σ²)·exp(−(ρ² + d²)/2σ²)·I0(ρd/σ²) dρ (Rice distribution), at most the
    // Rayleigh value. Reported shares are independent of d, so their mean estimates mean P(d).
    const i0 = (x: number) => {
      // I0(x) = Σ ((x/2)^k / k!)² (Abramowitz & Stegun 9.6.12)
      let term = 1;
      let sum = 1;
      for (let k = 1; k < 40; k++) {
        term *= (x / 2 / k) ** 2;
        sum += term;
      }
      return sum;
    };
    const rice = (d: number) =>
      simpson(
        (p) =>
          (p / sigma ** 2) *
          Math.exp(-(p * p + d * d) / (2 * sigma ** 2)) *
          i0((p * d) / sigma ** 2),
        0,
        tol,
        400,
      );
    expectClose(rice(0), rayleigh, 1e-9, 'Rice at d = 0 is Rayleigh');
    const expected = runs.reduce((a, r) => a + rice(r.nominalMiss_m), 0) / runs.length;
    const mean = runs.reduce((a, r) => a + r.pHit, 0) / runs.length;
    expect(expected).toBeLessThanOrEqual(rayleigh);
    expectClose(mean, expected, 3 * seMean, 'mean reported P(hit) against mean P(d)');
  });

  it('choosing the best time on the same samples (the old way) is biased high by over 3 SE', () => {
    const u = { x: Math.sin((track * Math.PI) / 180), y: Math.cos((track * Math.PI) / 180) };
    const table = new FallTable({
      top_m: 100,
      bottom_m: 0,
      descentRateSL_mps: 3,
      entryLoss_m: 0,
      isaOffset_K: 0,
      wind: new WindProfile([]),
    });
    const s = passiveSetup(table, { x: 0, y: 0 });
    const off = passiveOffset(s);
    // Release time of the plan point's chord: with no error every sample lands on the site, so the
    // window is the chord ±tol/V about it and its middle is that time.
    const s0 = planDrop(makePlan({ ...fileFor(1, landing), uncertainty: { turbulence: 'none' } }))
      .sites[0].releaseWindow!.best_s;
    let sum = 0;
    runs.forEach((r, i) => {
      // The planner's own main stream for this site and variant: the very samples it reports on.
      const seed = streamSeed(seeds[i], hashLabel('s'), hashLabel('drifter'));
      const { xs, ys } = fly(s, n, seed, { ...STILL, releasePosition_m: sigma });
      for (let j = 0; j < n; j++) {
        xs[j] -= off.x;
        ys[j] -= off.y;
      }
      // Same samples: shifted by the planner's chosen release, their median miss is its CEP.
      const b = r.releaseWindow!.best_s - s0;
      const miss = Float64Array.from(xs, (x, j) =>
        Math.hypot(x + u.x * speed * b, ys[j] + u.y * speed * b),
      ).sort();
      expectClose(r.cep_m, (miss[n / 2 - 1] + miss[n / 2]) / 2, 1e-3, 'CEP of the same samples');
      const prof = hitProfile(xs, ys, { x: 0, y: 0 }, tol, u, speed);
      sum += profileAt(prof, bestShift(prof).shift);
    });
    const before = sum / runs.length;
    const after = runs.reduce((a, r) => a + r.pHit, 0) / runs.length;
    expect(before - rayleigh).toBeGreaterThan(3 * seMean);
    expect(before - after).toBeGreaterThan(3 * seMean);
  });
});

describe('homing under gusts', () => {
  // Common practice: closed-loop guidance corrects the gusts it meets; an open-loop programme
  // cannot, and a passive vehicle corrects nothing. Moderate turbulence (W20 = 30 kt), no other
  // error, site 35 m from the uncontrolled landing (inside the steered reach).
  const layers = [
    { altitude_m: 10, fromDeg: 230, speed_mps: 3 },
    { altitude_m: 60, fromDeg: 250, speed_mps: 5 },
    { altitude_m: 150, fromDeg: 265, speed_mps: 7 },
  ];
  const steered = (id: string, guidance: 'fixed-heading' | 'homing') => ({
    id,
    guidance,
    descentRate_mps: 2.9,
    glideAngle_deg: 42,
    controlTime_s: 30,
    entryLoss_m: 6,
  });
  const base = (sites: PlanFile['sites'], extra: Partial<PlanFile> = {}) =>
    makePlan({
      winds: { reference: 'AGL', layers },
      release: { ...RELEASE, altitude_m: 120, reference: 'AGL' },
      carrier: { groundSpeed_mps: 10, trackDeg: 0 },
      variants: [
        { id: 'drifter', guidance: 'passive', descentRate_mps: 2.9 },
        steered('vane', 'fixed-heading'),
        steered('seeker', 'homing'),
      ],
      sites,
      ...extra,
    });
  const landing = planDrop(base([{ id: 'x', ...RELEASE }])).sites[0].byVariant[0].nominalLanding;
  const n = 1000;
  const r = planDrop(
    base([{ id: 's', ...offsetLatLng(landing, 25, 25), tolerance_m: 8 }], {
      uncertainty: { turbulence: 'moderate' },
      monteCarlo: { samples: n, seed: 17 },
    }),
  ).sites[0];
  const [passive, fixed, homing] = r.byVariant;

  it('the gusts are real: the fixed-heading spread is wider than the tolerance', () => {
    expect(fixed.gust_mps).toBeGreaterThan(0.5);
    expect(fixed.cep_m).toBeGreaterThan(8);
  });

  it('homing has the smallest CEP', () => {
    expect(fixed.reachable && homing.reachable).toBe(true);
    expect(homing.cep_m).toBeLessThan(fixed.cep_m);
    expect(homing.cep_m).toBeLessThan(passive.cep_m);
  });

  // Two independent proportions differ by a standard error ≤ √(2·0.25/n); demand 4 of them.
  it('homing has the highest P(hit), by more than the sampling error', () => {
    expect(homing.pHit - fixed.pHit).toBeGreaterThan(4 * Math.sqrt(0.5 / n));
    expect(homing.pHit - passive.pHit).toBeGreaterThan(4 * Math.sqrt(0.5 / n));
  });
});

describe('existing plans keep validating', () => {
  // docs/plan-format.md: the new fields are optional; absent means the modelled default.
  const docExample = (): unknown => {
    const md = readDoc();
    const block = /## Example\s+```json\n([\s\S]*?)```/.exec(md);
    expect(block).not.toBeNull();
    return JSON.parse(block![1]);
  };

  it('the demo plan, the format page’s example and a generated field validate unchanged', () => {
    for (const [name, file] of [
      ['demo', demo],
      ['doc example', docExample()],
      ['field', makeField(20, 3)],
    ] as const) {
      const u = (file as { uncertainty?: Record<string, unknown> }).uncertainty ?? {};
      for (const k of ['turbulence', 'gust_mps', 'gustTime_s', 'verticalAir_mps'])
        expect(k in u, `${name} has no ${k}`).toBe(false);
      const r = validatePlan(file, { now: NOW });
      expect(r.ok ? [] : r.errors, name).toEqual([]);
      if (!r.ok) continue;
      expect(r.plan.uncertainty.turbulence, name).toBe('auto');
      for (const k of ['gust_mps', 'gustTime_s', 'verticalAir_mps'])
        expect(Object.keys(r.plan.uncertainty), name).not.toContain(k);
    }
  });

  it('the demo plan flies modelled gusts and vertical air', () => {
    const r = planDrop(resolvePlan(demo as PlanFile, { now: NOW }), { probeSamples: 32 });
    for (const s of r.sites) {
      expect(s.gust_mps).toBeGreaterThan(0);
      expect(s.verticalAir_mps).toBeGreaterThan(0);
    }
    expect(r.errorSources.map((e) => e.id)).toEqual(
      expect.arrayContaining(['gust', 'verticalAir']),
    );
  });
});

describe('errorSources names what the Monte Carlo flies', () => {
  const windy = {
    reference: 'AGL' as const,
    layers: [{ altitude_m: 10, fromDeg: 200, speed_mps: 6 }],
  };
  const ids = (p: Plan) => errorSources(p).map((e) => e.id);

  it('auto and every class list gusts and vertical air as modelled', () => {
    for (const t of ['auto', 'light', 'moderate', 'severe'] as const) {
      const p = makePlan({ winds: windy, uncertainty: { turbulence: t } });
      const src = errorSources(p);
      expect(ids(p), t).toEqual(['gust', 'verticalAir']);
      for (const e of src) expect(e.detail, t).toMatch(/modelled/);
    }
  });

  it('turbulence none with nothing set lists neither', () => {
    const p = makePlan({ winds: windy, uncertainty: { turbulence: 'none', windSpeed_mps: 1 } });
    expect(ids(p)).toEqual(['wind']);
  });

  it('a set gust is named as set, and alone under turbulence none', () => {
    const p = makePlan({
      winds: windy,
      uncertainty: { turbulence: 'none', gust_mps: 1, gustTime_s: 5 },
    });
    const src = errorSources(p);
    expect(src.map((e) => e.id)).toEqual(['gust']);
    expect(src[0].detail).toMatch(/1 m\/s.*\(set\)/);
    expect(src[0].detail).toMatch(/5 s \(set\)/);
    const v = makePlan({ uncertainty: { turbulence: 'none', verticalAir_mps: 0.7 } });
    expect(errorSources(v).map((e) => [e.id, /\(set\)/.test(e.detail)])).toEqual([
      ['verticalAir', true],
    ]);
  });

  it('never lists a source whose σ is 0', () => {
    // Set to 0: replaces the modelled value of its kind, so that kind is gone.
    const p = makePlan({
      winds: windy,
      uncertainty: { turbulence: 'severe', gust_mps: 0, verticalAir_mps: 0, windSpeed_mps: 0 },
    });
    expect(ids(p)).toEqual([]);
  });

  it('never lists modelled gusts or vertical air that the calm air makes 0 (auto)', () => {
    // Auto in calm air: the wind at 20 ft is 0, so the modelled gust and vertical air are 0.
    const calm = makePlan({ uncertainty: { turbulence: 'auto' } });
    const r = planDrop(calm).sites[0];
    expect(r.gust_mps).toBe(0);
    expect(r.verticalAir_mps).toBe(0);
    expect(ids(calm)).toEqual([]);
  });
});

function readDoc(): string {
  return readFileSync(new URL('../../docs/plan-format.md', import.meta.url), 'utf8');
}
