import {
  area as turfArea,
  booleanContains,
  booleanPointInPolygon,
  lineString,
  point,
  pointToLineDistance,
  polygon,
} from '@turf/turf';
import type { Feature, Polygon } from 'geojson';
import { describe, expect, it } from 'vitest';
import { airAt } from '../../app/model/atmosphere';
import type { PlanFile, Variant } from '../../app/plan/plan';
import { planDrop, type PlanResult } from '../../app/planner';
import {
  DEFAULT_MANUAL_ITEMS,
  overallReady,
  readiness,
  type ManualItem,
} from '../../app/safety/readiness';
import {
  DEFAULT_SAFETY_SETTINGS,
  J_PER_FT_LBF,
  IMPACT_CAT2_FT_LBF,
  IMPACT_CAT3_FT_LBF,
  impactEnergy_J,
  safetyChecks,
  type CheckResult,
  type SafetySettings,
} from '../../app/safety/safety';
import { validatePlan } from '../../app/plan/validate';
import { ellipseRing, trackSegment } from '../../app/map/geometry';
import { NOW, RELEASE, expectClose, makePlan, offsetLatLng } from './helpers';

const PASSIVE: Variant = { id: 'drifter', guidance: 'passive', descentRate_mps: 3 };
const STEERED: Variant = {
  id: 'vane',
  guidance: 'fixed-heading',
  descentRate_mps: 3,
  glideAngle_deg: 45,
  controlTime_s: 30,
};

/** A validated plan (hovering at 100 m AGL, calm, one site 20 m north-east) with overrides. */
function plan(over: Partial<PlanFile> = {}) {
  const file: PlanFile = {
    format: 'seedfall-plan',
    version: 1,
    name: 'safety test',
    time: NOW.toISOString(),
    groundElevation_m: 0,
    release: { lat: RELEASE.lat, lon: RELEASE.lon, altitude_m: 100, reference: 'AGL' },
    carrier: { groundSpeed_mps: 0, trackDeg: 0 },
    winds: { reference: 'AGL', layers: [] },
    variants: [PASSIVE],
    sites: [{ id: 's1', ...offsetLatLng(RELEASE, 14, 14) }],
    monteCarlo: { samples: 200, seed: 7 },
    ...over,
  };
  const v = validatePlan(file, { now: NOW });
  if (!v.ok) throw new Error(JSON.stringify(v.errors));
  return v.plan;
}

function run(over: Partial<PlanFile> = {}, settings: Partial<SafetySettings> = {}) {
  const p = plan(over);
  const result = planDrop(p, { probeSamples: 64 });
  const report = safetyChecks(p, result, { ...DEFAULT_SAFETY_SETTINGS, ...settings });
  const check = (id: string): CheckResult => {
    const c = report.checks.find((x) => x.id === id);
    if (!c) throw new Error(`no check ${id}`);
    return c;
  };
  return { plan: p, result, report, check };
}

describe('safety checks', () => {
  it('lists the automatic checks under stable ids', () => {
    expect(run().report.checks.map((c) => c.id)).toEqual([
      'wind-limit',
      'wind-coverage',
      'ceiling',
      'terrain-clearance',
      'no-drop-zones',
      'hazard-area',
      'impact-energy',
      'magnetic-model',
      'daylight',
      'battery',
      'p-hit',
    ]);
  });

  describe('wind-limit', () => {
    const winds: PlanFile['winds'] = {
      reference: 'AGL',
      layers: [{ altitude_m: 50, fromDeg: 270, speed_mps: 5 }],
    };
    it('passes under the used variant limit and reports release and surface wind', () => {
      const { check } = run({ winds, variants: [{ ...PASSIVE, maxWind_mps: 8 }] });
      const c = check('wind-limit');
      expect(c.status).toBe('pass');
      // Hand calculation: constant 5 m/s above the 50 m layer; below it the 1/7 power law
      // (common practice) gives 5 × (10/50)^(1/7) = 3.973 m/s at 10 m.
      expectClose(c.numbers.release_mps as number, 5, 1e-3);
      expectClose(c.numbers.surface_mps as number, 5 * Math.pow(0.2, 1 / 7), 1e-3);
    });
    it('fails when the wind exceeds the limit of a used variant', () => {
      const c = run({ winds, variants: [{ ...PASSIVE, maxWind_mps: 4 }] }).check('wind-limit');
      expect(c.status).toBe('fail');
      expect(c.items).toContainEqual({ variant: 'drifter', limit_mps: 4, status: 'fail' });
    });
    it('warns when a used variant has no limit, and ignores unused variants', () => {
      const c = run({
        winds,
        variants: [PASSIVE, { ...PASSIVE, id: 'spare', maxWind_mps: 1 }],
        sites: [{ id: 's1', ...offsetLatLng(RELEASE, 14, 14), variant: 'drifter' }],
      }).check('wind-limit');
      expect(c.status).toBe('warn');
      expect(c.items).toEqual([{ variant: 'drifter', limit_mps: 'no limit set', status: 'warn' }]);
    });
  });

  describe('ceiling', () => {
    it('passes at 119 m and fails at 121 m AGL against a 120 m setting', () => {
      // 120 m: common practice; 14 CFR 107.51(b) is 400 ft = 121.92 m. Local rules govern.
      const at = (release: PlanFile['release'], ground = 0) =>
        run({ release, groundElevation_m: ground }).check('ceiling');
      const r = { lat: RELEASE.lat, lon: RELEASE.lon };
      expect(at({ ...r, altitude_m: 119, reference: 'AGL' }).status).toBe('pass');
      expect(at({ ...r, altitude_m: 121, reference: 'AGL' }).status).toBe('fail');
      // MSL release over ground at 300 m: 419 m MSL is 119 m AGL, 421 m MSL is 121 m AGL.
      const msl = at({ ...r, altitude_m: 419, reference: 'MSL' }, 300);
      expect(msl.status).toBe('pass');
      expectClose(msl.numbers.releaseAGL_m as number, 119, 1e-9);
      expect(at({ ...r, altitude_m: 421, reference: 'MSL' }, 300).status).toBe('fail');
      expect(msl.why).toMatch(/local rules govern/i);
    });
  });

  describe('no-drop-zones', () => {
    const noisy = { uncertainty: { windSpeed_mps: 0.5 } };
    /** A 100 m × 200 m zone whose west edge lies `gap_m` east of the ellipse's east tangent. */
    function zoneEastOf(r: PlanResult, gap_m: number): Feature<Polygon> {
      const e = r.sites[0].ellipse99;
      // Hand calculation: the ellipse's extent towards east (unit u = (1, 0)) is its support
      // h = √((a·sin az)² + (b·cos az)²).
      const s = Math.sin((e.azimuth_deg * Math.PI) / 180);
      const c = Math.cos((e.azimuth_deg * Math.PI) / 180);
      const h = Math.hypot(e.semiMajor_m * s, e.semiMinor_m * c);
      const x0 = h + gap_m;
      const corner = (x: number, y: number) => {
        const p = offsetLatLng(e.center, x, y);
        return [p.lon, p.lat];
      };
      const ring = [
        corner(x0, -100),
        corner(x0 + 100, -100),
        corner(x0 + 100, 100),
        corner(x0, 100),
      ];
      return polygon([[...ring, ring[0]]], { name: 'school' });
    }
    it('passes with the clearance of the nearest edge, checked by an independent distance', () => {
      const first = run(noisy);
      const zone = zoneEastOf(first.result, 30);
      const { report } = run(noisy, { noDropZones: [zone] });
      const c = report.checks.find((x) => x.id === 'no-drop-zones')!;
      expect(c.status).toBe('pass');
      // Reference: turf.pointToLineDistance from the ellipse centre to the west edge (geodesic),
      // minus the east extent h; the circumscribed 72-gon may add up to 0.1 % of a.
      const e = first.result.sites[0].ellipse99;
      const west = lineString([zone.geometry.coordinates[0][0], zone.geometry.coordinates[0][3]]);
      const d = pointToLineDistance(point([e.center.lon, e.center.lat]), west, { units: 'meters' });
      const s = Math.sin((e.azimuth_deg * Math.PI) / 180);
      const co = Math.cos((e.azimuth_deg * Math.PI) / 180);
      const expected = d - Math.hypot(e.semiMajor_m * s, e.semiMinor_m * co);
      expectClose(c.numbers.leastClearance_m as number, expected, 0.5 + 0.002 * e.semiMajor_m);
      expectClose(expected, 30, 0.5, 'construction of the test zone');
    });
    it('fails and names the site and zone when closer than the buffer or overlapping', () => {
      const first = run(noisy);
      const near = run(noisy, { noDropZones: [zoneEastOf(first.result, 5)] }).check(
        'no-drop-zones',
      );
      expect(near.status).toBe('fail');
      expect(near.items![0]).toMatchObject({ site: 's1', zone: 'school' });
      expectClose(near.items![0].clearance_m as number, 5, 0.6);
      const over = run(noisy, { noDropZones: [zoneEastOf(first.result, -20)] }).check(
        'no-drop-zones',
      );
      expect(over.status).toBe('fail');
      expect(over.items![0].clearance_m).toBe(0);
    });
    it('is not applicable without zones', () => {
      expect(run().check('no-drop-zones').status).toBe('n/a');
    });
  });

  describe('hazard-area', () => {
    const buffer = DEFAULT_SAFETY_SETTINGS.hazardBuffer_m;
    const containsRing = (hz: Feature, ring: [number, number][]) =>
      booleanContains(hz, polygon([ring.map(([lat, lon]) => [lon, lat])]));

    it('contains every 99 % ellipse and the track under each release window (moving carrier)', () => {
      const { result, report, check } = run({
        carrier: { groundSpeed_mps: 8, trackDeg: 60 },
        // Wind along the track, sites on the track line: passive carriers can reach both.
        winds: { reference: 'AGL', layers: [{ altitude_m: 50, fromDeg: 240, speed_mps: 4 }] },
        // Only the small errors below (no modelled gusts): the geometry, not the weather, is tested.
        uncertainty: { windSpeed_mps: 0.2, releaseTiming_s: 0.3, turbulence: 'none' },
        sites: [
          {
            id: 'a',
            ...offsetLatLng(RELEASE, 20 * Math.sin(Math.PI / 3), 20 * Math.cos(Math.PI / 3)),
            tolerance_m: 25,
          },
          {
            id: 'b',
            ...offsetLatLng(RELEASE, 160 * Math.sin(Math.PI / 3), 160 * Math.cos(Math.PI / 3)),
            tolerance_m: 25,
          },
        ],
        requiredPHit: 0.8,
      });
      const hz = report.hazardArea;
      expect(check('hazard-area').status).toBe('pass');
      let largest = { a: 0, b: 0 };
      for (const s of result.sites) {
        const e = s.ellipse99;
        expect(
          containsRing(hz, ellipseRing(e.center, e.semiMajor_m, e.semiMinor_m, e.azimuth_deg)),
        ).toBe(true);
        expect(s.releaseWindow).not.toBeNull();
        const w = s.releaseWindow!;
        for (const [lat, lon] of trackSegment(result.releasePoint, 60, 8, w.open_s, w.close_s, 9)) {
          expect(booleanPointInPolygon(point([lon, lat]), hz)).toBe(true);
        }
        if (e.semiMajor_m * e.semiMinor_m > largest.a * largest.b)
          largest = { a: e.semiMajor_m, b: e.semiMinor_m };
      }
      // Hand calculation: an ellipse grown by d covers πab + P·d + πd² with perimeter
      // P ≥ π(a + b), so at least π(a + d)(b + d); 1 % allowed for turf's spherical area.
      const floor = Math.PI * (largest.a + buffer) * (largest.b + buffer);
      expect(report.hazardArea_m2).toBeGreaterThan(0.99 * floor);
      expectClose(report.hazardArea_m2, turfArea(hz), 1e-6);
      expect(check('hazard-area').numbers.area_m2).toBe(Math.round(report.hazardArea_m2));
    });

    it('contains the hover release zone and stays within the sum of its pieces (hover)', () => {
      const { result, report } = run({ uncertainty: { windSpeed_mps: 0.1 } });
      const s = result.sites[0];
      const e = s.ellipse99;
      const z = s.releaseZone!;
      expect(z).not.toBeNull();
      const hz = report.hazardArea;
      expect(
        containsRing(hz, ellipseRing(e.center, e.semiMajor_m, e.semiMinor_m, e.azimuth_deg)),
      ).toBe(true);
      expect(
        containsRing(
          hz,
          ellipseRing(z.center, z.radius_m + buffer - 0.5, z.radius_m + buffer - 0.5, 0),
        ),
      ).toBe(true);
      // Hand calculation: ellipse grown by ρ = r + d covers πab + Pρ + πρ² with
      // P ≤ π√(2(a² + b²)); the zone disc grown by d covers π(r + d)². Their sum bounds the union.
      const rho = z.radius_m + buffer;
      const P = Math.PI * Math.sqrt(2 * (e.semiMajor_m ** 2 + e.semiMinor_m ** 2));
      const ceiling =
        Math.PI * e.semiMajor_m * e.semiMinor_m + P * rho + Math.PI * rho ** 2 + Math.PI * rho ** 2;
      expect(report.hazardArea_m2).toBeLessThan(1.01 * ceiling);
      expect(report.hazardArea_m2).toBeGreaterThan(
        0.99 * Math.PI * (e.semiMajor_m + rho) * (e.semiMinor_m + rho),
      );
    });
  });

  describe('impact-energy', () => {
    it('matches a hand calculation: 0.05 kg at 3 m/s down and 4 m/s across is 0.625 J', () => {
      // Hand calculation: v = √(3² + 4²) = 5 m/s, E = ½ · 0.05 · 25 = 0.625 J.
      expect(impactEnergy_J(0.05, 3, 4)).toBeCloseTo(0.625, 12);
      // Through the check: sea-level site (ISA ρ = 1.225, so w = 3 m/s), 4 m/s wind at 10 m AGL.
      const c = run({
        winds: { reference: 'AGL', layers: [{ altitude_m: 10, fromDeg: 270, speed_mps: 4 }] },
        variants: [{ ...PASSIVE, payloadMass_kg: 0.05, referenceMass_kg: 0.05 }],
      }).check('impact-energy');
      expect(c.status).toBe('pass');
      expect(c.items![0]).toMatchObject({ vertical_mps: 3, horizontal_mps: 4, energy_J: 0.625 });
      // 0.625 J / 1.3558179483 J per ft-lbf = 0.461 ft-lbf.
      expect(c.items![0].energy_ftlbf).toBeCloseTo(0.461, 3);
      expect(c.why).toMatch(/local rules govern/i);
    });

    it('converts ft-lbf exactly and places the thresholds at 14.9 J and 33.9 J', () => {
      // NIST SP 811 App. B: 1 ft = 0.3048 m, 1 lbf = 4.4482216152605 N → 1.3558179483 J.
      expect(J_PER_FT_LBF).toBeCloseTo(1.3558179483, 10);
      // 14 CFR 107 subpart D: Category 2 11 ft-lbf, Category 3 25 ft-lbf.
      expectClose(IMPACT_CAT2_FT_LBF * J_PER_FT_LBF, 14.9, 0.05);
      expectClose(IMPACT_CAT3_FT_LBF * J_PER_FT_LBF, 33.9, 0.05);
    });

    it('warns above 14.9 J, fails above 33.9 J, warns when the mass is unknown', () => {
      const energy = (m?: number) =>
        run({
          winds: { reference: 'AGL', layers: [{ altitude_m: 10, fromDeg: 270, speed_mps: 4 }] },
          variants: [
            m === undefined ? PASSIVE : { ...PASSIVE, payloadMass_kg: m, referenceMass_kg: m },
          ],
        }).check('impact-energy');
      // Hand calculation: E = ½ m · 25: 2 kg → 25 J (warn), 3 kg → 37.5 J (fail).
      expect(energy(2).status).toBe('warn');
      expect(energy(2).items![0].energy_J).toBeCloseTo(25, 6);
      expect(energy(3).status).toBe('fail');
      const unknown = energy(undefined);
      expect(unknown.status).toBe('warn');
      expect(unknown.items![0]).toMatchObject({ variant: 'drifter', note: 'mass unknown' });
    });

    it('adds the steering speed w·cot γ for steered variants', () => {
      // Hand calculation: γ = 45°, w = 3 → u = 4 + 3 = 7, v² = 9 + 49 = 58, E = ½·0.05·58 = 1.45 J.
      const c = run({
        winds: { reference: 'AGL', layers: [{ altitude_m: 10, fromDeg: 270, speed_mps: 4 }] },
        variants: [{ ...STEERED, payloadMass_kg: 0.05, referenceMass_kg: 0.05 }],
      }).check('impact-energy');
      expect(c.items![0].energy_J).toBeCloseTo(1.45, 3);
    });

    it('scales the descent rate with density at the site elevation', () => {
      // U.S. Standard Atmosphere 1976: ρ(2000 m geopotential) = 1.00649 kg/m³; geometric 2000 m
      // is 1999.37 m geopotential (ρ ≈ 1.00655). Momentum theory: w = 3·√(1.225/ρ) ≈ 3.3096 m/s.
      const c = run({
        groundElevation_m: 2000,
        variants: [{ ...PASSIVE, payloadMass_kg: 0.05, referenceMass_kg: 0.05 }],
      }).check('impact-energy');
      expectClose(c.items![0].vertical_mps as number, 3 * Math.sqrt(1.225 / 1.00655), 2e-3);
      expectClose(airAt(2000).density_kgm3, 1.00655, 1e-4, 'atmosphere cross-check');
    });
  });

  describe('magnetic-model', () => {
    it('passes inside and fails outside WMM2025 validity for fixed-heading plans', () => {
      // WMM2025 validity 2024-11-13 … 2029-11-13 (NOAA NCEI / BGS release).
      const fixed = { variants: [STEERED] };
      expect(run(fixed).check('magnetic-model').status).toBe('pass');
      expect(run({ ...fixed, time: '2030-01-10T10:00:00Z' }).check('magnetic-model').status).toBe(
        'fail',
      );
      expect(run().check('magnetic-model').status).toBe('n/a');
    });
  });

  describe('daylight', () => {
    it('passes at mid-morning and fails in the middle of the night', () => {
      // suncalc 2.0.2 civil dawn at 47.5° N 21.1° E on 2026-06-01 is about 02:05 UT and dusk
      // about 19:00 UT (reference library); 10:00 UT is daytime, 00:30 UT is night.
      expect(run().check('daylight').status).toBe('pass');
      const night = run({ time: '2026-06-01T00:30:00Z' }).check('daylight');
      expect(night.status).toBe('fail');
      expect(typeof night.numbers.dawn).toBe('string');
    });
  });

  describe('battery', () => {
    const lateral = {
      carrier: { groundSpeed_mps: 6, trackDeg: 0 },
      variants: [STEERED],
      sites: [{ id: 'side', ...offsetLatLng(RELEASE, 40, 0), tolerance_m: 15 }],
    };
    it('passes with 20 % in reserve and fails when the margin leaves less than the thrust', () => {
      const { result, check } = run(lateral);
      // Hand calculation: 40 m across track at cot γ = 1 needs 40 m of steered drop, ≈ 13 s at
      // ≈ 3 m/s, within 80 % of the 30 s control time (24 s) but not 40 % (12 s).
      expectClose(result.sites[0].thrustTime_s!, 13.3, 1);
      expect(check('battery').status).toBe('pass');
      const tight = run(lateral, { thrustMargin_pct: 60 }).check('battery');
      expect(tight.status).toBe('fail');
      expect(tight.items).toEqual([{ site: 'side', thrust_s: expect.any(Number), limit_s: 12 }]);
    });
    it('is not applicable without fixed-heading sites', () => {
      expect(run().check('battery').status).toBe('n/a');
    });
  });

  describe('p-hit', () => {
    it('passes when every site meets the requirement and lists the sites that do not', () => {
      expect(run().check('p-hit').status).toBe('pass');
      const c = run({
        carrier: { groundSpeed_mps: 6, trackDeg: 0 },
        sites: [
          { id: 'on-track', ...offsetLatLng(RELEASE, 0, 30) },
          { id: 'far', ...offsetLatLng(RELEASE, 100, 0) },
        ],
      }).check('p-hit');
      expect(c.status).toBe('fail');
      expect(c.items).toEqual([
        {
          site: 'far',
          variant: 'drifter',
          pHit: 0,
          pHitSE: 0,
          note: 'no variant can reach this site',
        },
      ]);
      expect(c.sites).toEqual(['far']);
      // A passive drifter cannot leave the track's line: said as such, not as a chosen variant.
      expect(c.why).toBe(
        '1 site is below the required P(hit) of 0.9: far (no variant can reach it).',
      );
    });
  });
});

describe('readiness', () => {
  const check = (id: string, status: CheckResult['status']): CheckResult => ({
    id,
    title: id,
    status,
    why: '',
    numbers: {},
  });
  const done = (items: readonly ManualItem[]): ManualItem[] =>
    items.map((m) => ({ ...m, state: 'done', who: 'A. Crew', when: NOW.toISOString() }));
  const passing = [
    check('ceiling', 'pass'),
    check('impact-energy', 'warn'),
    check('battery', 'n/a'),
  ];
  const failing = [...passing, check('wind-limit', 'fail')];

  it('starts with eight open manual items with distinct ids', () => {
    expect(DEFAULT_MANUAL_ITEMS).toHaveLength(8);
    expect(new Set(DEFAULT_MANUAL_ITEMS.map((m) => m.id)).size).toBe(8);
    expect(DEFAULT_MANUAL_ITEMS.every((m) => m.state === 'open')).toBe(true);
    expect(overallReady(passing, DEFAULT_MANUAL_ITEMS)).toBe(false);
  });

  it('is ready with no failing check and every item done or n/a; warnings do not block', () => {
    const manual = done(DEFAULT_MANUAL_ITEMS);
    manual[0] = { ...manual[0], state: 'n/a' };
    expect(readiness(passing, manual)).toEqual({ ready: true, blocking: [], overridden: false });
    expect(overallReady(passing, manual)).toBe(true);
  });

  it('blocks on a failing check unless overridden with a written reason', () => {
    const manual = done(DEFAULT_MANUAL_ITEMS);
    const who = 'B. Lead';
    const when = NOW.toISOString();
    expect(readiness(failing, manual)).toEqual({
      ready: false,
      blocking: ['check:wind-limit'],
      overridden: false,
    });
    expect(overallReady(failing, manual)).toBe(false);
    expect(readiness(failing, manual, { reason: '  ', who, when }).ready).toBe(false);
    expect(
      readiness(failing, manual, { reason: 'gusts measured 6 m/s on site', who, when }),
    ).toEqual({
      ready: true,
      blocking: [],
      overridden: true,
    });
  });

  it('never lets an override cover an open manual item', () => {
    const manual = done(DEFAULT_MANUAL_ITEMS);
    manual[3] = { ...manual[3], state: 'open' };
    const r = readiness(failing, manual, {
      reason: 'accepted',
      who: 'B. Lead',
      when: NOW.toISOString(),
    });
    expect(r.ready).toBe(false);
    expect(r.blocking).toEqual([`manual:${manual[3].id}`]);
  });
});

describe('impact energy with a sounding', () => {
  it('uses the sounding’s air: warmer, thinner air gives a faster touchdown and more energy', () => {
    // Momentum theory (Leishman ch. 12, via docs/references.md): w ∝ ρ^−½, so E = ½m(w² + u²) grows
    // when the sounding is warmer than the ISA at the same pressure.
    const base = {
      release: { ...RELEASE, altitude_m: 100, reference: 'AGL' as const },
      variants: [
        {
          id: 'p',
          guidance: 'passive' as const,
          descentRate_mps: 4,
          payloadMass_kg: 0.2,
          referenceMass_kg: 0.2,
        },
      ],
      sites: [{ id: 's', ...RELEASE }],
      monteCarlo: { samples: 20, seed: 1 },
    };
    const energy = (extra: object) => {
      const plan = makePlan({ ...base, ...extra });
      const c = safetyChecks(plan, planDrop(plan)).checks.find((x) => x.id === 'impact-energy')!;
      return Number(c.numbers.worst_J);
    };
    const isa = energy({});
    const warm = energy({
      atmosphere: {
        sounding: {
          levels: [0, 1000].map((z) => ({
            altitude_m: z,
            temperature_K: airAt(z).temperature_K + 40,
          })),
        },
      },
    });
    expect(warm).toBeGreaterThan(isa);
  });
});

describe('no-drop zones over the whole release window', () => {
  it('fails when a release inside the window lands in a zone even if the best release does not', () => {
    // Calm air, no error, carrier north at 10 m/s, tolerance 20 m: a passive release lands on
    // the site at the best time and anywhere within ±20 m along the track inside the window
    // (the chord of the tolerance circle). A 2 m square 14 m north of the site is 13 m from the
    // best landing (clear of a 5 m buffer) but under the window's landings.
    const site = offsetLatLng(RELEASE, 0, 60);
    const plan = makePlan({
      carrier: { groundSpeed_mps: 10, trackDeg: 0 },
      sites: [{ id: 's', ...site, tolerance_m: 20 }],
    });
    const result = planDrop(plan);
    expect(result.sites[0].releaseWindow).not.toBeNull();
    const c = offsetLatLng(site, 0, 14);
    const sq = [
      [-1, -1],
      [1, -1],
      [1, 1],
      [-1, 1],
      [-1, -1],
    ].map(([e, n]) => {
      const p = offsetLatLng(c, e, n);
      return [p.lon, p.lat];
    });
    const zone: Feature<Polygon> = {
      type: 'Feature',
      properties: { name: 'culvert' },
      geometry: { type: 'Polygon', coordinates: [sq] },
    };
    const settings: SafetySettings = {
      ...DEFAULT_SAFETY_SETTINGS,
      noDropZones: [zone],
      noDropBuffer_m: 5,
    };
    const check = safetyChecks(plan, result, settings).checks.find(
      (x) => x.id === 'no-drop-zones',
    )!;
    expect(check.status).toBe('fail');
    // Moved 30 m north, beyond the window's reach (20 m + 5 m buffer), the zone is clear.
    const far = {
      ...zone,
      geometry: {
        type: 'Polygon' as const,
        coordinates: [
          sq.map(([lon, lat]) => {
            const p = offsetLatLng({ lat, lon }, 0, 16);
            return [p.lon, p.lat];
          }),
        ],
      },
    };
    const ok = safetyChecks(plan, result, { ...settings, noDropZones: [far] }).checks.find(
      (x) => x.id === 'no-drop-zones',
    )!;
    expect(ok.status).toBe('pass');
  });
});
