import fc from 'fast-check';
import { describe, expect, it } from 'vitest';
import demo from '../../data/demo-plan.json';
import { schemaBounds, schemaMaxItems } from '../../app/formats/import-limits';
import type { PlanFile } from '../../app/plan/plan';
import { validatePlan } from '../../app/plan/validate';
import { blendSurfaceReading } from '../../app/formats/surface-reading';
import {
  HELLMANN_NEUTRAL,
  mergeSurfaceProfile,
  surfaceProfile,
  TERRAIN,
  type TerrainClass,
} from '../../app/model/surface-wind';
import { windComponents } from '../../app/model/wind';
import { expectClose } from './helpers';

const reading = { height_m: 10, speed_mps: 5, fromDeg: 240 };
const at = (layers: { altitude_m: number; speed_mps: number }[], z: number) =>
  layers.find((l) => l.altitude_m === z)!;

describe('terrain classes', () => {
  it('carry the Davenport–Wieringa roughness lengths', () => {
    // Davenport–Wieringa roughness classification (WMO), docs/references.md.
    const z0: Record<TerrainClass, number> = {
      sea: 0.0002,
      smooth: 0.005,
      open: 0.03,
      'roughly-open': 0.1,
      rough: 0.25,
      'very-rough': 0.5,
      closed: 1.0,
      chaotic: 2.0,
    };
    for (const [k, v] of Object.entries(z0)) expect(TERRAIN[k as TerrainClass].z0_m).toBe(v);
  });

  it('have exponents that grow with roughness', () => {
    // Kaltschmitt et al. (2007) p. 55: exponents rise from open water (0.10) to inhabited (0.34).
    expect(HELLMANN_NEUTRAL).toEqual({ openWater: 0.1, flatOpenCoast: 0.16, inhabited: 0.34 });
    const order: TerrainClass[] = [
      'sea',
      'smooth',
      'open',
      'roughly-open',
      'rough',
      'very-rough',
      'closed',
      'chaotic',
    ];
    for (let i = 1; i < order.length; i++) {
      expect(TERRAIN[order[i]].alpha).toBeGreaterThan(TERRAIN[order[i - 1]].alpha);
    }
  });
});

describe('power law', () => {
  const ratio = (terrain: TerrainClass, alpha?: number) =>
    at(surfaceProfile(reading, { law: 'power', terrain, upTo_m: 100, alpha }), 100).speed_mps /
    reading.speed_mps;

  it('uses the Hellmann exponents of Kaltschmitt et al. for water, coast and inhabited land', () => {
    // Kaltschmitt et al., Renewable Energy (2007) p. 55, neutral: open water 0.10, flat open
    // coast 0.16, human inhabited areas 0.34 → u(100)/u(10) = 10^α.
    expectClose(ratio('sea'), 10 ** 0.1, 1e-12, 'open water'); // 1.258925…
    expectClose(ratio('open', HELLMANN_NEUTRAL.flatOpenCoast), 10 ** 0.16, 1e-12, 'coast'); // 1.445440…
    expectClose(ratio('closed'), 10 ** 0.34, 1e-12, 'inhabited'); // 2.187762…
  });

  it('uses 1/7 over open land and can take the IEC 61400-1 exponent 0.2', () => {
    // common practice: α = 1/7 over open land → 10^(1/7) = 1.389495…
    expectClose(ratio('open'), 1.3894954943731377, 1e-12);
    // IEC 61400-1 normal wind profile: α = 0.2 → 10^0.2 = 1.584893…
    expectClose(ratio('open', 0.2), 1.5848931924611136, 1e-12);
    expect(TERRAIN['roughly-open'].alpha).toBe(0.2);
  });
});

describe('log law', () => {
  it('matches a hand calculation for z0 = 0.03 m', () => {
    // Log law u = (u*/κ) ln(z/z0), κ ≈ 0.4 (docs/references.md); κ and u* cancel in the ratio:
    // u(100)/u(10) = ln(100/0.03)/ln(10/0.03) = ln(3333.33…)/ln(333.33…)
    //              = 8.111728083308073 / 5.809142990314028 = 1.3963725969275156.
    const l = surfaceProfile(reading, { law: 'log', terrain: 'open', upTo_m: 100 });
    expectClose(at(l, 100).speed_mps / 5, 1.3963725969275156, 1e-12);
    expectClose(at(l, 100).speed_mps / 5, 1.396, 0.0005);
  });

  it('falls back to no layers where the log law is undefined (reading at or below z0)', () => {
    expect(
      surfaceProfile({ ...reading, height_m: 0.5 }, { law: 'log', terrain: 'closed', upTo_m: 100 }),
    ).toEqual([]);
    expect(
      surfaceProfile(
        { ...reading, speed_mps: NaN },
        { law: 'power', terrain: 'open', upTo_m: 100 },
      ),
    ).toEqual([]);
  });
});

describe('surface profile shape', () => {
  it('starts at the reading, steps evenly and ends at upTo_m, with the reading direction', () => {
    fc.assert(
      fc.property(
        fc.double({ min: 2.5, max: 20, noNaN: true }), // above the largest z0 (2 m)
        fc.double({ min: 0, max: 25, noNaN: true }),
        fc.double({ min: 0, max: 359, noNaN: true }),
        fc.double({ min: 25, max: 400, noNaN: true }),
        fc.constantFrom<'log' | 'power'>('log', 'power'),
        fc.constantFrom<TerrainClass>('sea', 'open', 'rough', 'chaotic'),
        (h, u, dir, top, law, terrain) => {
          const l = surfaceProfile(
            { height_m: h, speed_mps: u, fromDeg: dir },
            { law, terrain, upTo_m: top, step_m: 7 },
          );
          // The profile reproduces the reading at its height (common practice).
          expect(l[0]).toEqual({ altitude_m: h, fromDeg: dir, speed_mps: u });
          expect(l[l.length - 1].altitude_m).toBe(top);
          for (let i = 1; i < l.length; i++) {
            expect(l[i].altitude_m).toBeGreaterThan(l[i - 1].altitude_m);
            expect(l[i].altitude_m - l[i - 1].altitude_m).toBeLessThanOrEqual(7 + 1e-9);
            expect(l[i].speed_mps).toBeGreaterThanOrEqual(l[i - 1].speed_mps);
            expect(l[i].fromDeg).toBe(dir);
          }
        },
      ),
    );
  });
});

describe('merging under a forecast', () => {
  const forecast = [
    { altitude_m: 150, fromDeg: 270, speed_mps: 9 },
    { altitude_m: 300, fromDeg: 280, speed_mps: 12 },
  ];
  const surface = surfaceProfile(reading, { law: 'log', terrain: 'open', upTo_m: 150, step_m: 10 });
  const merged = mergeSurfaceProfile(forecast, surface);

  it('keeps the forecast at and above its lowest layer and the reading at its height', () => {
    expect(merged.filter((l) => l.altitude_m >= 150)).toEqual(forecast);
    expect(merged[0]).toEqual({ altitude_m: 10, fromDeg: 240, speed_mps: 5 });
    expect(merged.map((l) => l.altitude_m)).toEqual(
      [...merged.map((l) => l.altitude_m)].sort((a, b) => a - b),
    );
  });

  it('meets the forecast without a jump', () => {
    const below = merged[merged.length - forecast.length - 1];
    expect(below.altitude_m).toBe(140);
    const a = windComponents(below.fromDeg, below.speed_mps);
    const f = windComponents(270, 9);
    // One step (10 m of 140) under the forecast layer the wind is within a few percent of it.
    expect(Math.hypot(a.east_mps - f.east_mps, a.north_mps - f.north_mps)).toBeLessThan(0.5);
  });

  it('returns either list alone when the other is empty', () => {
    expect(mergeSurfaceProfile([], surface)).toEqual(surface);
    expect(mergeSurfaceProfile(forecast, [])).toEqual(forecast);
  });
});

describe('blending a surface reading within the plan’s limits', () => {
  const max = schemaMaxItems('winds.layers');

  it('widens the profile spacing so a 3,000 m blend stays within the layer limit, and says so', () => {
    // At 10 m spacing from 2 m to 3000 m the blend would have 300 + 2 = 302 layers.
    const forecast = [
      { altitude_m: 3000, fromDeg: 270, speed_mps: 15 },
      { altitude_m: 4000, fromDeg: 280, speed_mps: 20 },
    ];
    const r = blendSurfaceReading(
      forecast,
      { height_m: 2, speed_mps: 4, fromDeg: 250 },
      {
        law: 'log',
        terrain: 'open',
        upTo_m: 3000,
      },
    );
    expect(r.added).toBe(true);
    expect(r.layers.length).toBeLessThanOrEqual(max);
    expect(r.layers.slice(-2)).toEqual(forecast);
    expect(r.layers[0]).toEqual({ altitude_m: 2, fromDeg: 250, speed_mps: 4 });
    const step = Math.ceil(2998 / (max - 2));
    expect(r.layers[1].altitude_m).toBe(2 + step);
    expect(r.problems).toEqual([
      `surface profile spaced every ${step} m instead of 10 m so the plan's wind holds at most ${max} layers`,
    ]);
  });

  it('keeps the 10 m spacing and reports nothing when it fits', () => {
    const r = blendSurfaceReading(
      [{ altitude_m: 150, fromDeg: 270, speed_mps: 9 }],
      { height_m: 10, speed_mps: 5, fromDeg: 240 },
      { law: 'log', terrain: 'open', upTo_m: 150 },
    );
    expect(r.problems).toEqual([]);
    expect(r.layers.map((l) => l.altitude_m)).toEqual([
      10, 20, 30, 40, 50, 60, 70, 80, 90, 100, 110, 120, 130, 140, 150,
    ]);
  });

  it('refuses a blend that would leave the schema’s speed range, naming the altitude', () => {
    // Log law over a city centre (z0 2 m): 60 m/s at 3 m becomes ln(1000/2)/ln(3/2) ≈ 15× aloft.
    const r = blendSurfaceReading(
      [],
      { height_m: 3, speed_mps: 60, fromDeg: 240 },
      {
        law: 'log',
        terrain: 'chaotic',
        upTo_m: 1000,
      },
    );
    expect(r.added).toBe(false);
    expect(r.layers).toEqual([]);
    expect(r.problems[0]).toMatch(
      /^the extended profile at [\d.]+ m AGL has speed_mps [\d.]+ is outside the plan's range .*; the surface profile was not added$/,
    );
  });

  it('refuses when the forecast already fills the plan', () => {
    const full = Array.from({ length: max }, (_, i) => ({
      altitude_m: 100 + i,
      fromDeg: 0,
      speed_mps: 1,
    }));
    const r = blendSurfaceReading(full, reading, { law: 'power', terrain: 'open', upTo_m: 100 });
    expect(r.added).toBe(false);
    expect(r.layers).toEqual(full);
  });

  it('never gives the demo plan layers it rejects', () => {
    // Property: any reading and forecast depth, the blend validates as the plan's winds.layers.
    const top = schemaBounds('winds.layers[].altitude_m').max!;
    fc.assert(
      fc.property(
        fc.double({ min: 0.5, max: 100, noNaN: true }),
        fc.double({ min: 0, max: 100, noNaN: true }),
        fc.double({ min: 0, max: 360, noNaN: true }),
        fc.uniqueArray(fc.integer({ min: 20, max: top }), { maxLength: max }),
        fc.constantFrom(...(['sea', 'open', 'rough', 'chaotic'] as TerrainClass[])),
        fc.constantFrom('log' as const, 'power' as const),
        (h, v, d, alts, terrain, law) => {
          const forecast = alts.map((z) => ({ altitude_m: z, fromDeg: 90, speed_mps: 10 }));
          const lowest = alts.length ? Math.min(...alts) : 100;
          const r = blendSurfaceReading(
            forecast,
            { height_m: h, speed_mps: v, fromDeg: d },
            {
              law,
              terrain,
              upTo_m: Math.max(lowest, h + 1),
            },
          );
          const plan = structuredClone(demo) as unknown as PlanFile;
          plan.winds = { reference: 'AGL', layers: r.layers };
          const res = validatePlan(plan);
          // Plan-level drift bounds aside (strong winds over a long fall are the user's call).
          const issues = res.ok ? [] : res.errors.filter((e) => e.path.startsWith('winds'));
          expect(issues.slice(0, 3)).toEqual([]);
        },
      ),
      { numRuns: 200 },
    );
  });
});
