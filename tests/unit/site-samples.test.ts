import { describe, expect, it } from 'vitest';
import { evenIndices, planDrop, siteSamples } from '../../app/planner';
import { validatePlan } from '../../app/plan/validate';
import demo from '../../data/demo-plan.json';
import { expectClose, makePlan } from './helpers';

function demoPlan() {
  const v = validatePlan(structuredClone(demo));
  if (!v.ok) throw new Error(v.errors.map((e) => e.message).join('; '));
  return v.plan;
}

/** Median as the textbook defines it: the middle of the sorted values, or the mean of the two middle ones. */
function textbookMedian(values: number[]): number {
  const s = [...values].sort((a, b) => a - b);
  const n = s.length;
  return n % 2 === 1 ? s[(n - 1) / 2] : (s[n / 2 - 1] + s[n / 2]) / 2;
}

describe('a site’s Monte Carlo landings as the planner reported them', () => {
  const plan = demoPlan();
  const result = planDrop(plan);

  it('give exactly the P(hit) and CEP of every site × variant of the demo plan (the table’s numbers)', () => {
    // The outside truth is planDrop's own report, which the results table shows: the share of
    // the returned points within the tolerance and their median distance are counted here with
    // no planner code, and must equal it exactly (same seed, release and best-time shift).
    for (const s of result.sites) {
      for (const c of s.comparison) {
        const got = siteSamples(plan, s.id, c.variant);
        expect(got, `${s.id}/${c.variant}`).not.toBeNull();
        if (!got) continue;
        expect(got.east_m.length).toBe(plan.monteCarlo.samples);
        const d = Array.from(got.east_m, (e, i) => Math.hypot(e, got.north_m[i]));
        const tol = plan.sites.find((p) => p.id === s.id)!.tolerance_m;
        expect(got.tolerance_m).toBe(tol);
        const hits = d.filter((x) => x <= tol).length;
        expect(hits / d.length, `${s.id}/${c.variant} P(hit)`).toBe(c.pHit);
        // 1 nm: Math.hypot and √(x² + y²) may differ in the last bit (IEEE 754 rounding).
        expectClose(textbookMedian(d), c.cep_m, 1e-9, `${s.id}/${c.variant} CEP`);
      }
    }
  });

  it('centres the ellipses on the mean landing and re-flies the same result as the plan', () => {
    const s = result.sites[0];
    const got = siteSamples(plan, s.id, s.variant)!;
    const n = got.east_m.length;
    const meanE = got.east_m.reduce((a, b) => a + b, 0) / n;
    const meanN = got.north_m.reduce((a, b) => a + b, 0) / n;
    // Sample mean (common practice); 1 mm allows only for summation order.
    expectClose(got.ellipse50.east_m, meanE, 1e-3, 'ellipse centre east');
    expectClose(got.ellipse95.north_m, meanN, 1e-3, 'ellipse centre north');
    // The 95 % ellipse of a normal is √(−2 ln 0.05)/√(−2 ln 0.5) ≈ 2.0781 times the 50 % one
    // (Hoover 1984; common practice).
    expectClose(
      got.ellipse95.semiMajor_m / got.ellipse50.semiMajor_m,
      Math.sqrt(Math.log(20) / Math.log(2)),
      1e-9,
    );
    expect(got.result.pHit).toBe(s.pHit);
    expect(got.result.release).toEqual(s.release);
  });

  it('returns null for a site or variant that is not in the plan', () => {
    expect(siteSamples(plan, 'no-such-site', plan.variants[0].id)).toBeNull();
    expect(siteSamples(plan, plan.sites[0].id, 'no-such-variant')).toBeNull();
  });

  it('gives the same points on every call (seeded, nothing shared between calls)', () => {
    const a = siteSamples(plan, 's03', 'beacon-seek')!;
    const b = siteSamples(plan, 's03', 'beacon-seek')!;
    expect(Array.from(a.east_m)).toEqual(Array.from(b.east_m));
  });
});

describe('the fall profile beside the landings', () => {
  it('runs from the release height to the ground at the descent rate in calm air, with no drift', () => {
    // Hovering at 100 m AGL over sea-level ground, calm air, 3 m/s at sea level: the fall takes
    // about 100/3 ≈ 33 s (a few per cent less, as the air above is thinner; ISA, common practice).
    const plan = makePlan();
    const got = siteSamples(plan, 's1', 'drifter')!;
    const p = got.profile;
    expectClose(p.height_m[0], 100, 1e-9, 'release height');
    expectClose(p.height_m[p.height_m.length - 1], 0, 1e-9, 'ground');
    expect(p.time_s[0]).toBe(0);
    expectClose(p.time_s[p.time_s.length - 1], got.result.fallTime_s, 1e-9, 'fall time');
    expectClose(got.result.fallTime_s, 100 / 3, 0.05 * (100 / 3), 'fall time against h/w');
    for (let i = 1; i < p.time_s.length; i++) {
      expect(p.time_s[i]).toBeGreaterThan(p.time_s[i - 1]);
      expect(p.height_m[i]).toBeLessThan(p.height_m[i - 1]);
    }
    expect(Math.max(...p.driftEast_m.map(Math.abs), ...p.driftNorth_m.map(Math.abs))).toBe(0);
    expect(p.time_s.length).toBeLessThanOrEqual(200);
  });

  it('thins long lists evenly, keeping the first and the last', () => {
    expect(evenIndices(5, 200)).toEqual([0, 1, 2, 3, 4]);
    const k = evenIndices(100_001, 200);
    expect(k.length).toBe(200);
    expect(k[0]).toBe(0);
    expect(k[199]).toBe(100_000);
    expect(new Set(k).size).toBe(200);
  });
});
