import { describe, expect, it } from 'vitest';
import { resolvePlan } from '../../app/plan';
import type { PlanFile, ResolvedVariant } from '../../app/plan/plan';
import { planDrop, recommend, windCoverageWarnings } from '../../app/planner';
import demo from '../../data/demo-plan.json';
import { makePlan, offsetLatLng, RELEASE } from './helpers';

const v = (id: string, cost?: number): ResolvedVariant =>
  ({
    id,
    name: id,
    guidance: 'passive',
    descentRate_mps: 3,
    glideAngle_deg: 90,
    controlTime_s: 0,
    entryLoss_m: 0,
    ...(cost === undefined ? {} : { cost }),
  }) as ResolvedVariant;

// The rule is ours (docs/model.md §10): cheapest meeting the requirement, ties in catalogue order.
describe('the recommendation rule', () => {
  const cands = (...p: [string, number, boolean][]) =>
    p.map(([variant, pHit, reachable]) => ({ variant, pHit, reachable }));

  it('without costs picks the first in catalogue order that meets P(hit)', () => {
    const r = recommend(
      cands(['a', 0.5, true], ['b', 0.95, true], ['c', 0.99, true]),
      [v('a'), v('b'), v('c')],
      0.9,
    );
    expect(r).toMatchObject({ variant: 'b', kind: 'meets' });
    expect(r.why).toContain('first in catalogue order of 2 variants');
  });

  it('picks the cheapest variant that meets P(hit), whatever its place in the catalogue', () => {
    const r = recommend(
      cands(['homing', 0.99, true], ['passive', 0.92, true], ['fixed', 0.97, true]),
      [v('homing', 50), v('passive', 10), v('fixed', 20)],
      0.9,
    );
    expect(r).toMatchObject({ variant: 'passive', kind: 'meets' });
    expect(r.why).toBe('the cheapest of 3 variants that meet P(hit) ≥ 0.90 (cost 10; next 20)');
  });

  it('a cheaper variant that misses P(hit) is not picked', () => {
    const r = recommend(
      cands(['cheap', 0.89, true], ['dear', 0.91, true]),
      [v('cheap', 1), v('dear', 5)],
      0.9,
    );
    expect(r.variant).toBe('dear');
    expect(r.why).toBe('the only variant that meets P(hit) ≥ 0.90');
  });

  it('ties in cost go to the earlier variant in the catalogue', () => {
    const r = recommend(
      cands(['x', 0.95, true], ['y', 0.99, true], ['z', 0.99, true]),
      [v('x', 7), v('y', 3), v('z', 3)],
      0.9,
    );
    expect(r.variant).toBe('y');
  });

  it('when none meets P(hit) names the best and says so', () => {
    const r = recommend(
      cands(['a', 0.4, true], ['b', 0.7, true], ['c', 0.7, true]),
      [v('a'), v('b'), v('c')],
      0.9,
    );
    expect(r).toMatchObject({ variant: 'b', kind: 'below' });
    expect(r.why).toContain('no variant meets P(hit) ≥ 0.90');
  });

  it('when no variant can reach the site says that instead of a choice', () => {
    const r = recommend(cands(['a', 0, false], ['b', 0.01, false]), [v('a', 1), v('b', 2)], 0.9);
    expect(r.kind).toBe('unreachable');
    expect(r.why).toBe('no variant can reach this site from the planned release');
  });
});

describe('the recommendation in planDrop', () => {
  const base: Partial<PlanFile> = {
    winds: { reference: 'AGL', layers: [{ altitude_m: 50, fromDeg: 270, speed_mps: 4 }] },
    carrier: { groundSpeed_mps: 0, trackDeg: 0 },
    uncertainty: { turbulence: 'none' },
    variants: [
      { id: 'drifter', guidance: 'passive', descentRate_mps: 3, cost: 4 },
      {
        id: 'seeker',
        guidance: 'homing',
        descentRate_mps: 3,
        glideAngle_deg: 40,
        controlTime_s: 30,
        cost: 20,
      },
    ],
  };
  // Hovering, no uncertainty: a site at the drifter's uncontrolled landing is hit by both.
  const landing = planDrop(makePlan({ ...base, sites: [{ id: 'x', ...RELEASE }] })).sites[0]
    .byVariant[0].nominalLanding;

  it('takes the cheaper of two variants that both meet P(hit), and lists their costs', () => {
    const s = planDrop(makePlan({ ...base, sites: [{ id: 's', ...landing }] })).sites[0];
    expect(s.byVariant.map((b) => b.pHit)).toEqual([1, 1]);
    expect(s.recommended).toBe('drifter');
    expect(s.comparison.map((c) => c.cost)).toEqual([4, 20]);
    // Swap the costs: the seeker becomes the cheaper one.
    const swapped = planDrop(
      makePlan({
        ...base,
        variants: [
          { ...base.variants![0], cost: 30 },
          { ...base.variants![1], cost: 20 },
        ],
        sites: [{ id: 's', ...landing }],
      }),
    ).sites[0];
    expect(swapped.recommended).toBe('seeker');
  });

  it('a site 2 km beside the carrier track is unreachable for every variant and said so', () => {
    // Flying north: the track point nearest the site still leaves it 2 km east of every landing.
    const far = offsetLatLng(landing, 2000, 0);
    const moving = { ...base, carrier: { groundSpeed_mps: 12, trackDeg: 0 } };
    const s = planDrop(makePlan({ ...moving, sites: [{ id: 'far', ...far }] })).sites[0];
    expect(s.byVariant.every((b) => !b.reachable)).toBe(true);
    expect(s.recommendation.kind).toBe('unreachable');
  });
});

describe('wind layers that do not cover the fall', () => {
  const demoFile = demo as unknown as PlanFile;
  const withLayers = (layers: { altitude_m: number }[], altitude_m = 110) =>
    resolvePlan(
      {
        ...demoFile,
        release: { ...demoFile.release, altitude_m, reference: 'AGL' },
        winds: {
          reference: 'AGL',
          layers: layers.map((l) => ({ ...l, fromDeg: 270, speed_mps: 8 })),
        },
      },
      { now: new Date('2026-12-01T08:30:00Z') },
    );
  const top = (p: ReturnType<typeof withLayers>) => p.release.altitude_m + p.groundElevation_m;

  it('a bulletin whose lowest layer is 715 m above a 110 m release: the whole fall extrapolated, by 605 m', () => {
    // A winds-aloft bulletin's lowest level over a low site (common practice: 3000 ft ≈ 914 m MSL).
    const p = withLayers([{ altitude_m: 715 }, { altitude_m: 1630 }]);
    const w = windCoverageWarnings(p, top(p));
    expect(w).toHaveLength(1);
    expect(w[0]).toContain('715 m above the plan ground');
    expect(w[0]).toContain('605 m above the release');
    expect(planDrop(p).warnings).toContain(w[0]);
  });

  it('a top layer 60 m below the release: the top 60 m use that layer unchanged', () => {
    const p = withLayers([{ altitude_m: 10 }, { altitude_m: 50 }]);
    const w = windCoverageWarnings(p, top(p));
    expect(w).toEqual([expect.stringContaining('60 m below the release')]);
  });

  it('the demo plan’s layers cover its fall: no warning', () => {
    const p = resolvePlan(demoFile, { now: new Date('2026-12-01T08:30:00Z') });
    expect(windCoverageWarnings(p, top(p))).toEqual([]);
  });

  it('no layers at all: calm air, said once', () => {
    const p = withLayers([]);
    expect(windCoverageWarnings(p, top(p))).toEqual([expect.stringContaining('calm air')]);
  });
});
