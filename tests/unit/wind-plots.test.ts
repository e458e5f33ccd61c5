import { XMLValidator } from 'fast-xml-parser';
import { describe, expect, it } from 'vitest';
import type { Plan, PlanFile } from '../../app/plan/plan';
import { planDrop } from '../../app/planner/planner';
import { altitudeSweep } from '../../app/planner/sweeps';
import { hodographSvg, sweepSvg } from '../../app/brief/wind-plots';
import { validatePlan } from '../../app/plan/validate';
import demoJson from '../../data/demo-plan.json';
import { expectClose, makePlan, offsetLatLng, RELEASE } from './helpers';

const demoFile = demoJson as unknown as PlanFile;

type Layers = NonNullable<PlanFile['winds']>['layers'];

function windPlan(layers: Layers, release_m = 100, extra: Partial<PlanFile> = {}): Plan {
  return makePlan({
    winds: { reference: 'AGL', layers },
    release: { ...RELEASE, altitude_m: release_m, reference: 'AGL' },
    ...extra,
  });
}

/** Trace vertices (east, north m/s) read back from the drawn polyline. */
function traceOf(svg: string): [number, number][] {
  const m = /<polyline class="trace" points="([^"]*)"/.exec(svg);
  expect(m, 'the hodograph has a trace').not.toBeNull();
  return m![1].split(' ').map((p) => p.split(',').map(Number) as [number, number]);
}

/** The m/s → pixel transform of the trace group: [a, b, c, d, e, f]. */
function traceTransform(svg: string): number[] {
  const m = /<g transform="matrix\(([^)]*)\)"><polyline/.exec(svg);
  expect(m).not.toBeNull();
  return m![1].split(',').map(Number);
}

function releaseMark(svg: string): { east: number; north: number } {
  const m = /<g class="rel" data-east="([^"]*)" data-north="([^"]*)"/.exec(svg);
  expect(m).not.toBeNull();
  return { east: Number(m![1]), north: Number(m![2]) };
}

describe('the hodograph', () => {
  it('is a single point east of the centre for a uniform wind from 270° at 5 m/s', () => {
    // common practice: meteorological direction is where the wind comes FROM, so air from the
    // west (270°) moves toward the east: the vector's tip is at east +5, north 0.
    const svg = hodographSvg(windPlan([{ altitude_m: 0, fromDeg: 270, speed_mps: 5 }]));
    const pts = traceOf(svg);
    expect(pts.length).toBeGreaterThanOrEqual(2);
    for (const [e, n] of pts) {
      expectClose(e, 5, 1e-3, 'east');
      expectClose(n, 0, 1e-3, 'north');
    }
    expect(releaseMark(svg)).toEqual({ east: 5, north: 0 });
    // Equal scales on both axes with north up: x = a·east + e, y = d·north + f, d = −a.
    const [a, b, c, d] = traceTransform(svg);
    expect(a).toBeGreaterThan(0);
    expect([b, c]).toEqual([0, 0]);
    expect(d).toBe(-a);
    expect(svg).toMatch(/>N<\/text>/);
    expect(svg).toMatch(/>E<\/text>/);
  });

  it('runs from the surface tip to the upper tip, clockwise, for a wind veering 90°', () => {
    // common practice: a wind that veers (turns clockwise) with height draws a clockwise
    // hodograph. From 270° at the surface (tip east +5) to 360° at 200 m (tip south, north −5).
    const plan = windPlan(
      [
        { altitude_m: 0, fromDeg: 270, speed_mps: 5 },
        { altitude_m: 200, fromDeg: 360, speed_mps: 5 },
      ],
      200,
    );
    const svg = hodographSvg(plan);
    const pts = traceOf(svg);
    expectClose(pts[0][0], 5, 1e-3, 'ground east');
    expectClose(pts[0][1], 0, 1e-3, 'ground north');
    const last = pts[pts.length - 1];
    expectClose(last[0], 0, 1e-3, 'top east');
    expectClose(last[1], -5, 1e-3, 'top north');
    // Cross product of the surface and upper tips (east×north) is negative: a clockwise turn.
    expect(pts[0][0] * last[1] - pts[0][1] * last[0]).toBeLessThan(0);
    expect(releaseMark(svg)).toEqual({ east: 0, north: -5 });
    expect(svg).toContain('>0 m</text>');
    expect(svg).toContain('>200 m</text>');
    // Marking a lower release moves the marker onto the trace between the two layers; the
    // profile interpolates components linearly (docs/model.md §2), so halfway is (2.5, −2.5).
    const mid = releaseMark(hodographSvg(plan, { releaseAltitudeMSL_m: 100 }));
    expectClose(mid.east, 2.5, 1e-3, 'mid east');
    expectClose(mid.north, -2.5, 1e-3, 'mid north');
  });

  it('comes in to calm at the ground below the lowest layer', () => {
    // The surface power law makes the wind zero at the ground (docs/model.md §2).
    const pts = traceOf(hodographSvg(windPlan([{ altitude_m: 50, fromDeg: 180, speed_mps: 4 }])));
    expect(pts[0]).toEqual([0, 0]);
    expectClose(pts[pts.length - 1][1], 4, 1e-3, 'north above the layer');
  });

  it('is well-formed XML and shows a hostile plan name as text', () => {
    const name = `<script>alert("x")</script> & 'co'`;
    const plan = windPlan([{ altitude_m: 0, fromDeg: 90, speed_mps: 3 }], 100, { name });
    const svg = hodographSvg(plan);
    expect(XMLValidator.validate(svg)).toBe(true);
    expect(svg).not.toContain('<script');
    expect(svg).toContain('&lt;script&gt;alert(&quot;x&quot;)&lt;/script&gt; &amp; &#39;co&#39;');
    expect(XMLValidator.validate(hodographSvg(windPlan([])))).toBe(true);
  });
});

describe('the release-altitude sweep', () => {
  it('spreads a passive variant more the higher it is released, as σ·T of the wind error', () => {
    // A wind error that stays the same over the whole fall moves the landing by δw·T (T the fall
    // time), so the spread grows with T and so with altitude. With σ per axis the landings are
    // circular normal with σ·T per axis, whose CEP is √(2 ln 2)·σ·T ≈ 1.1774·σ·T (common practice:
    // median of the Rayleigh distribution). Tolerance 15 %: about four standard errors of a
    // 400-sample median (≈ 3.6 %) plus the short forward-throw term.
    const plan = makePlan({
      uncertainty: { windSpeed_mps: 1, windCorrelation_m: 1e6 },
      monteCarlo: { samples: 2000, seed: 3 },
    });
    const alts = [50, 100, 200, 400];
    const sweep = altitudeSweep(plan, 's1', 'drifter', alts);
    expect(sweep.map((p) => p.altitude_m)).toEqual(alts);
    for (const p of sweep) {
      expect(p.pHit).toBeGreaterThanOrEqual(0);
      expect(p.pHit).toBeLessThanOrEqual(1);
    }
    for (let i = 1; i < sweep.length; i++) {
      expect(sweep[i].cep_m).toBeGreaterThan(sweep[i - 1].cep_m);
    }
    for (const p of sweep) {
      const direct = planDrop({
        ...plan,
        release: { ...plan.release, altitude_m: p.altitude_m, reference: 'AGL' },
        monteCarlo: { ...plan.monteCarlo, samples: 1 },
      });
      const T = direct.sites[0].fallTime_s;
      expectClose(
        p.cep_m,
        Math.sqrt(2 * Math.LN2) * 1 * T,
        0.15 * 1.1774 * T,
        `CEP at ${p.altitude_m} m`,
      );
    }
    expect(sweep[0].pHit).toBeGreaterThan(sweep[3].pHit);
  });

  it('agrees with planDrop on reachability and P(hit) when nothing is uncertain', () => {
    // A moving carrier over high ground with the release given MSL; a crosswind carries the
    // passive drop sideways by about wind × fall time, so only low releases stay within 10 m.
    const base: Partial<PlanFile> = {
      groundElevation_m: 250,
      release: { ...RELEASE, altitude_m: 400, reference: 'MSL' },
      carrier: { groundSpeed_mps: 10, trackDeg: 0 },
      winds: {
        reference: 'AGL',
        layers: [
          { altitude_m: 10, fromDeg: 270, speed_mps: 2 },
          { altitude_m: 300, fromDeg: 260, speed_mps: 3 },
        ],
      },
      variants: [
        {
          id: 'glider',
          guidance: 'fixed-heading',
          descentRate_mps: 3,
          glideAngle_deg: 40,
          controlTime_s: 6,
        },
        { id: 'drifter', guidance: 'passive', descentRate_mps: 3 },
      ],
      sites: [
        { id: 's1', ...offsetLatLng(RELEASE, -30, 150) },
        { id: 's2', ...offsetLatLng(RELEASE, 14, 300) },
      ],
    };
    const plan = makePlan(base);
    const alts = [10, 20, 40, 80, 160];
    const sweep = altitudeSweep(plan, 's2', 'drifter', alts);
    expect(sweep).toHaveLength(alts.length);
    for (const p of sweep) {
      const direct = planDrop({
        ...plan,
        release: { ...plan.release, altitude_m: p.altitude_m, reference: 'AGL' },
      });
      const r = direct.sites
        .find((s) => s.id === 's2')!
        .byVariant.find((v) => v.variant === 'drifter')!;
      expect(p.reachable, `reachable at ${p.altitude_m} m`).toBe(r.reachable);
      expect(p.pHit, `P(hit) at ${p.altitude_m} m`).toBe(r.pHit);
    }
    // Both outcomes occur, so the agreement above is not vacuous.
    expect(sweep.some((p) => p.reachable)).toBe(true);
    expect(sweep.some((p) => !p.reachable)).toBe(true);
  });

  it('names an unknown site or variant', () => {
    const plan = makePlan();
    expect(() => altitudeSweep(plan, 'nope', 'drifter', [50])).toThrow(/site "nope"/);
    expect(() => altitudeSweep(plan, 's1', 'nope', [50])).toThrow(/variant "nope"/);
  });
});

describe('the sweep plot', () => {
  const points = [
    { altitude_m: 150, pHit: 0.4, pHitSE: 0.01, cep_m: 30, reachable: true },
    { altitude_m: 50, pHit: 0.95, pHitSE: 0.01, cep_m: 8, reachable: true },
    { altitude_m: 100, pHit: 0.7, pHitSE: 0.01, cep_m: 16, reachable: false },
  ];

  it('draws one P(hit) point and one CEP point per altitude, in altitude order', () => {
    const svg = sweepSvg(points, { requiredPHit: 0.9, title: 'Site <A> & "B"' });
    expect(XMLValidator.validate(svg)).toBe(true);
    const ph = [
      ...svg.matchAll(/<circle class="ph[^"]*" data-alt="([^"]*)" cx="([^"]*)" cy="([^"]*)"/g),
    ];
    expect(ph.map((m) => Number(m[1]))).toEqual([50, 100, 150]);
    const xs = ph.map((m) => Number(m[2]));
    expect(xs).toEqual([...xs].sort((a, b) => a - b));
    // Higher P(hit) is drawn higher (smaller SVG y).
    const ys = ph.map((m) => Number(m[3]));
    expect(ys[0]).toBeLessThan(ys[1]);
    expect(ys[1]).toBeLessThan(ys[2]);
    expect(svg.match(/<rect class="cep"/g)).toHaveLength(3);
    expect(svg.match(/class="ph unreach"/g)).toHaveLength(1);
    // The requirement line sits between the 0.95 and 0.7 points.
    const req = /<line class="req"[^>]* y1="([^"]*)"/.exec(svg);
    expect(req).not.toBeNull();
    expect(Number(req![1])).toBeGreaterThan(ys[0]);
    expect(Number(req![1])).toBeLessThan(ys[1]);
    expect(svg).toContain('Site &lt;A&gt; &amp; &quot;B&quot;');
    expect(svg).not.toContain('<A>');
  });

  it('leaves out the requirement line unless asked, and copes with no points', () => {
    expect(sweepSvg(points)).not.toContain('class="req"');
    const empty = sweepSvg([]);
    expect(XMLValidator.validate(empty)).toBe(true);
    expect(empty).toContain('no altitudes');
  });
});

describe('altitude sweep below the site', () => {
  it('leaves out release heights at or below the site’s ground instead of reporting hits', () => {
    // common practice: nothing released below a site can fall onto it.
    const d = structuredClone(demoFile);
    d.monteCarlo = { samples: 50, seed: 1 };
    d.sites[0].elevation_m = (d.groundElevation_m ?? 0) + 60;
    const v = validatePlan(d);
    if (!v.ok) throw new Error(v.errors.map((e) => e.message).join('; '));
    const pts = altitudeSweep(v.plan, d.sites[0].id, v.plan.variants[0].id, [40, 60, 80, 110]);
    expect(pts.map((p) => p.altitude_m)).toEqual([80, 110]);
  });
});
