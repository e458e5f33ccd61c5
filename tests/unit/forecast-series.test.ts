import fc from 'fast-check';
import { describe, expect, it } from 'vitest';
import {
  ForecastSeries,
  pHitTimeline,
  windowsFromTimeline,
  type TimelineEntry,
} from '../../app/planner/forecast-series';
import { planDrop } from '../../app/planner/planner';
import { WindProfile, windComponents } from '../../app/model/wind';
import { expectClose, makePlan } from './helpers';

const T0 = '2026-06-01T09:00:00Z';
const T1 = '2026-06-01T12:00:00Z';
const T2 = '2026-06-01T15:00:00Z';
const P0 = [
  { altitude_m: 50, fromDeg: 200, speed_mps: 3 },
  { altitude_m: 200, fromDeg: 220, speed_mps: 6 },
];
const P1 = [
  { altitude_m: 50, fromDeg: 260, speed_mps: 5 },
  { altitude_m: 120, fromDeg: 270, speed_mps: 7 },
  { altitude_m: 200, fromDeg: 280, speed_mps: 9 },
];
const P2 = [{ altitude_m: 100, fromDeg: 90, speed_mps: 2 }];
const series = new ForecastSeries([
  { time: T1, layers: P1 },
  { time: T0, layers: P0 },
  { time: T2, layers: P2 },
]);

describe('forecast series in time', () => {
  it('reproduces each profile exactly at its valid time', () => {
    // common practice: an interpolant passes through its nodes.
    expect(series.profileAt(T0)).toEqual(P0);
    expect(series.profileAt(T1)).toEqual(P1);
    expect(series.profileAt(new Date(T2))).toEqual(P2);
    expect(series.problems).toEqual([]);
  });

  it('holds the first and last profile outside the span', () => {
    // common practice: no extrapolation in time beyond the forecast.
    expect(series.profileAt('2026-06-01T06:00:00Z')).toEqual(P0);
    expect(series.profileAt(Date.parse(T2) + 3600e3)).toEqual(P2);
  });

  it('gives the component average at the midpoint, at every altitude of either profile', () => {
    // Linear interpolation in time: at the midpoint each component is the mean of the two.
    const mid = series.profileAt('2026-06-01T10:30:00Z');
    expect(mid.map((l) => l.altitude_m)).toEqual([50, 100, 120, 200]);
    const a = new WindProfile(P0);
    const b = new WindProfile(P1);
    for (const l of mid) {
      const v = windComponents(l.fromDeg, l.speed_mps);
      const va = a.at(l.altitude_m);
      const vb = b.at(l.altitude_m);
      expectClose(v.east_mps, (va.east_mps + vb.east_mps) / 2, 1e-12, `east at ${l.altitude_m}`);
      expectClose(
        v.north_mps,
        (va.north_mps + vb.north_mps) / 2,
        1e-12,
        `north at ${l.altitude_m}`,
      );
    }
  });

  it('moves each component linearly between valid times', () => {
    const a = new WindProfile(P0);
    const b = new WindProfile(P1);
    fc.assert(
      fc.property(fc.double({ min: 0, max: 1, noNaN: true }), (w) => {
        const t = Date.parse(T0) + w * (Date.parse(T1) - Date.parse(T0));
        // As the planner reads it: a WindProfile of the interpolated layers.
        const v = new WindProfile(series.profileAt(t)).at(120);
        const e = a.at(120).east_mps + w * (b.at(120).east_mps - a.at(120).east_mps);
        expectClose(v.east_mps, e, 1e-9);
      }),
    );
  });

  it('reports unreadable and repeated times and keeps the rest', () => {
    const s = new ForecastSeries([
      { time: 'tomorrow', layers: P0 },
      { time: T0, layers: P0 },
      { time: '2026-06-01T09:00:00.000Z', layers: P1 },
    ]);
    expect(s.times).toEqual([Date.parse(T0)]);
    expect(s.problems[0]).toMatch(/profiles\[0\]\.time "tomorrow" is not an ISO 8601 time/);
    expect(s.problems[1]).toMatch(/profiles\[2\]\.time .* repeats an earlier profile/);
    expect(new ForecastSeries([]).profileAt(T0)).toEqual([]);
  });
});

describe('P(hit) over clock time', () => {
  it('evaluates every step over the span and agrees with planDrop at a valid time', () => {
    const plan = makePlan({ uncertainty: { windSpeed_mps: 1, windCorrelation_m: 300 } });
    const two = new ForecastSeries([
      { time: T0, layers: P0 },
      { time: '2026-06-01T09:30:00Z', layers: P1 },
    ]);
    const tl = pHitTimeline(plan, two, { step_s: 900, samples: 100 });
    expect(tl.map((e) => e.time)).toEqual([
      '2026-06-01T09:00:00.000Z',
      '2026-06-01T09:15:00.000Z',
      '2026-06-01T09:30:00.000Z',
    ]);
    const direct = planDrop(
      {
        ...plan,
        time: '2026-06-01T09:00:00.000Z',
        winds: { ...plan.winds, layers: P0 },
        monteCarlo: { ...plan.monteCarlo, samples: 100 },
      },
      { probeSamples: 64 },
    );
    expect(tl[0].sites[0].pHit).toBe(direct.sites[0].pHit);
    for (const e of tl) {
      expect(e.sites[0].pHit).toBeGreaterThanOrEqual(0);
      expect(e.sites[0].pHit).toBeLessThanOrEqual(1);
    }
  });

  it('turns a timeline into clock-time windows per site', () => {
    const entry = (time: string, a: number, b: number): TimelineEntry => ({
      time,
      sites: [
        {
          id: 's1',
          pHit: a,
          pHitSE: 0.01,
          variant: 'v1',
          meetsRequired: a >= 0.9,
          byVariant: [
            { variant: 'v1', pHit: a, pHitSE: 0.01 },
            { variant: 'v2', pHit: b, pHitSE: 0.01 },
          ],
        },
      ],
    });
    const tl = [
      entry('09:00', 0.95, 0.5),
      entry('09:15', 0.92, 0.95),
      entry('09:30', 0.5, 0.95),
      entry('09:45', 0.91, 0.2),
    ];
    expect(windowsFromTimeline(tl, 0.9)).toEqual([
      {
        id: 's1',
        windows: [
          { open: '09:00', close: '09:15', variants: ['v1'] },
          { open: '09:45', close: '09:45', variants: ['v1'] },
        ],
      },
    ]);
    expect(windowsFromTimeline(tl, 0.9, { variant: 'v2' })[0].windows).toEqual([
      { open: '09:15', close: '09:30', variants: ['v2'] },
    ]);
  });
});
