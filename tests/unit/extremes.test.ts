import fc from 'fast-check';
import { describe, expect, it } from 'vitest';
import { FallTable } from '../../app/model/fall-table';
import { FRAME_LIMIT_M, variantExtent } from '../../app/plan/plan-limits';
import { planDrop, type PlanResult } from '../../app/planner';
import { hitProfile, runAround, searchEdge } from '../../app/model/release-window';
import { formatPlanText } from '../../app/brief/report-text';
import { validatePlan } from '../../app/plan/validate';
import { WindProfile } from '../../app/model/wind';
import demo from '../../data/demo-plan.json';
import { NOW, geodesicDistance_m } from './helpers';

// `+ 0` turns -0 into 0, which is what JSON gives back.
const num = (min: number, max: number) => fc.double({ min, max, noNaN: true }).map((x) => x + 0);

/**
 * Plans anywhere inside the documented ranges (docs/plan-format.md, "Ranges"), leaning on the
 * extremes: fast-check draws range ends more often than the middle.
 */
const extremePlan = fc
  .record({
    ground: num(-400, 5000),
    isa: num(-60, 60),
    release: fc.record({
      lat: num(-85, 85),
      lon: num(-179, 179),
      agl: fc.oneof(num(1, 60), num(60, 10000)),
    }),
    speed: fc.oneof(fc.constant(0), num(0.5, 100)),
    track: num(0, 360),
    layers: fc.uniqueArray(
      fc.record({ altitude_m: num(-500, 20000), fromDeg: num(0, 360), speed_mps: num(0, 100) }),
      { selector: (l) => l.altitude_m, maxLength: 4 },
    ),
    exponent: num(0, 1),
    variants: fc.array(
      fc.record({
        guidance: fc.constantFrom('passive', 'fixed-heading', 'homing'),
        descentRate_mps: num(0.05, 30),
        glideAngle_deg: num(1, 89.9),
        controlTime_s: num(0, 3600),
        entryLoss_m: num(0, 10000),
        // With the ratio below, both masses stay inside 0.001 … 100 kg.
        referenceMass_kg: num(0.004, 25),
        ratio: num(0.26, 3.9),
        throwTime_s: fc.option(num(0, 10)),
      }),
      { minLength: 1, maxLength: 3 },
    ),
    sites: fc.array(
      fc.record({
        dLat: num(-0.45, 0.45),
        dLon: num(-0.45, 0.45),
        below: num(0, 100),
        tolerance_m: num(0.1, 10000),
      }),
      { minLength: 1, maxLength: 3 },
    ),
    u: fc.record({
      windSpeed_mps: num(0, 30),
      windCorrelation_m: num(1, 100000),
      descentRate_pct: num(0, 49.9),
      releasePosition_m: num(0, 1000),
      heading_deg: num(0, 180),
      releaseTiming_s: num(0, 10),
    }),
    samples: fc.integer({ min: 1, max: 48 }),
    seed: fc.integer({ min: 0, max: 4294967295 }),
    pHit: num(0.01, 1),
  })
  .map((g) => ({
    format: 'seedfall-plan',
    version: 1,
    time: '2026-06-01T10:00:00Z',
    groundElevation_m: g.ground,
    atmosphere: { isaOffset_K: g.isa },
    winds: { reference: 'MSL', layers: g.layers, surfaceExponent: g.exponent },
    release: { lat: g.release.lat, lon: g.release.lon, altitude_m: g.release.agl },
    carrier: { groundSpeed_mps: g.speed, trackDeg: g.track },
    variants: g.variants.map(({ ratio, throwTime_s, ...v }, i) => ({
      ...v,
      id: `v${i}`,
      payloadMass_kg: v.referenceMass_kg * ratio,
      ...(throwTime_s === null ? {} : { throwTime_s }),
    })),
    sites: g.sites.map((s, i) => ({
      id: `s${i}`,
      lat: g.release.lat + s.dLat,
      lon: g.release.lon + s.dLon,
      elevation_m: g.ground - s.below,
      tolerance_m: s.tolerance_m,
    })),
    uncertainty: g.u,
    monteCarlo: { samples: g.samples, seed: g.seed },
    requiredPHit: g.pHit,
  }));

/** Fields documented as null when there is none (README, docs/plan-format.md). */
const NULLABLE = new Set([
  'releaseWindow',
  'releaseZone',
  'headingMag_deg',
  'declination_deg',
  'declinationModel',
]);

/** Every number finite and every null at a documented nullable field; returns the bad paths. */
function badValues(x: unknown, path = 'result'): string[] {
  if (typeof x === 'number') return Number.isFinite(x) ? [] : [`${path} = ${x}`];
  if (x === null) return NULLABLE.has(path.split('.').pop()!) ? [] : [`${path} = null`];
  if (typeof x !== 'object' || x === undefined) return [];
  return Object.entries(x).flatMap(([k, v]) =>
    badValues(v, Array.isArray(x) ? `${path}[${k}]` : `${path}.${k}`),
  );
}

/** Release points and nominal landings of a result (deterministic positions, no Monte Carlo). */
function positions(r: PlanResult): { what: string; lat: number; lon: number }[] {
  return r.sites.flatMap((s) =>
    s.byVariant.flatMap((v) => [
      { what: `${s.id}/${v.variant} release`, ...v.release },
      { what: `${s.id}/${v.variant} nominalLanding`, ...v.nominalLanding },
      ...(v.releaseWindow ? [{ what: `${s.id}/${v.variant} best`, ...v.releaseWindow.best }] : []),
      ...(v.releaseZone ? [{ what: `${s.id}/${v.variant} zone`, ...v.releaseZone.center }] : []),
    ]),
  );
}

const LIMIT_MESSAGE = /at most 50\.0 km is supported$|sites must be within 50\.0 km of it$/;
const SCALED_MESSAGE = /scaled by √\(payloadMass_kg \/ referenceMass_kg\)/;

describe('extreme but valid plans (docs/plan-format.md, "Ranges" and "Limits across fields")', () => {
  // contract: docs/plan-format.md — every plan inside the ranges either is refused only by the
  // limits across fields, or plans with finite numbers and positions within 3 × 50 km.
  it('planDrop gives finite numbers, no stray null, and positions within the documented bound', () => {
    let planned = 0;
    fc.assert(
      fc.property(extremePlan, (file) => {
        const v = validatePlan(file, { now: NOW });
        if (!v.ok) {
          for (const e of v.errors) {
            expect(LIMIT_MESSAGE.test(e.message) || SCALED_MESSAGE.test(e.message), e.message).toBe(
              true,
            );
          }
          return;
        }
        planned++;
        const r = planDrop(v.plan, { probeSamples: 16 });
        expect(badValues(r)).toEqual([]);
        expect(badValues(JSON.parse(JSON.stringify(r)))).toEqual([]);
        for (const p of positions(r)) {
          const d = geodesicDistance_m(v.plan.release, p);
          expect(d, p.what).toBeLessThanOrEqual(3 * FRAME_LIMIT_M);
        }
        for (const [i, variant] of v.plan.variants.entries()) {
          const e = variantExtent(v.plan, variant);
          expect(e.extent_m, `variants[${i}]`).toBeLessThanOrEqual(FRAME_LIMIT_M);
          for (const s of r.sites) {
            const res = s.byVariant[i];
            // The bound integrates in coarser cells (a 512th of the fall): the same reach to
            // well within 0.1 %.
            expect(res.reachRadius_m).toBeLessThanOrEqual(e.reach_m * 1.001 + 1e-9);
          }
        }
      }),
      { numRuns: 30 },
    );
    // The property is only worth something if plans got through to the planner.
    expect(planned).toBeGreaterThan(5);
  }, 120_000);
});

describe('core guards against non-finite or oversized input', () => {
  it('the chord sweep drops non-finite landings and still ends', () => {
    const xs = Float64Array.from([0, NaN, Infinity, 1e308, 5]);
    const ys = Float64Array.from([0, 0, 0, 1e308, NaN]);
    const pr = hitProfile(xs, ys, { x: 0, y: 0 }, 10, { x: 1, y: 0 }, 1);
    // Only the first landing is finite and within the tolerance: one chord [-10, 10].
    expect(Array.from(pr.s)).toEqual([-10, 10]);
    expect(Array.from(pr.p)).toEqual([1 / 5, 0]);
    expect(runAround(pr, 0, 0.2)).toEqual([-10, 10]);
  });

  it('an empty profile has no window, whatever the requirement', () => {
    const empty = { s: new Float64Array(0), p: new Float64Array(0) };
    expect(runAround(empty, 0, 0)).toBeNull();
  });

  // Bisection (common practice): a step function with its edge at 3 is found within 8 / 2^8.
  it('searchEdge finds a bounded edge and says when the search limit was reached', () => {
    let calls = 0;
    const step = (s: number) => (calls++, Math.abs(s) <= 3 ? 1 : 0);
    const e = searchEdge(step, 1, 0.5, 6, 8);
    expect(e.bounded).toBe(true);
    expect(Math.abs(e.edge - 3)).toBeLessThanOrEqual(8 / 2 ** 8);
    calls = 0;
    const always = searchEdge(() => (calls++, 1), -1, 0.5, 6, 8);
    expect(always.bounded).toBe(false);
    expect(always.edge).toBeLessThan(-60); // close to the farthest point tried, −64
    expect(Number.isFinite(always.edge)).toBe(true);
    expect(calls).toBe(6 + 1 + 8);
  });

  it('a fall table refuses a cell count beyond its cap instead of allocating it', () => {
    const base = {
      top_m: 10000,
      bottom_m: 0,
      descentRateSL_mps: 3,
      entryLoss_m: 0,
      isaOffset_K: 0,
      wind: new WindProfile([]),
    };
    expect(() => new FallTable({ ...base, cell_m: 1e-6 })).toThrow(RangeError);
    expect(() => new FallTable({ ...base, band_m: 1e-3 })).toThrow(RangeError);
    expect(() => new FallTable({ ...base, descentRateSL_mps: 1e-320 * 0 })).toThrow(RangeError);
    expect(() => new FallTable({ ...base, descentRateSL_mps: Infinity })).toThrow(RangeError);
    expect(new FallTable(base).fallTime_s).toBeGreaterThan(0);
  });
});

describe('unbounded edges in the text report', () => {
  it('an edge at the search limit is marked and explained; a found edge is not', () => {
    const v = validatePlan({ ...demo, monteCarlo: { samples: 50, seed: 1 } }, { now: NOW });
    if (!v.ok) throw new Error('demo plan invalid');
    const r = planDrop(v.plan, { probeSamples: 16 });
    const site = r.sites.find((s) => s.releaseWindow)!;
    expect(formatPlanText(v.plan, r)).not.toContain('search stopped at its limit');
    site.releaseWindow = { ...site.releaseWindow!, closeUnbounded: true };
    const text = formatPlanText(v.plan, r);
    const row = text.split('\n').find((l) => l.startsWith(`${site.id} `))!;
    expect(row).toContain(`..>${site.releaseWindow.close_s.toFixed(1)}`);
    expect(text).toContain(
      '< > = the search stopped at its limit; the window or zone reaches farther',
    );
  });
});
