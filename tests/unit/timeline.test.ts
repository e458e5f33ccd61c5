import { describe, expect, it } from 'vitest';
import type { TimelineEntry } from '../../app/planner/forecast-series';
import { timelineSvg } from '../../app/brief/timeline-svg';
import { timelineSection } from '../../app/brief/timeline-section';
import { resolvePlan } from '../../app/plan';
import type { PlanFile } from '../../app/plan/plan';
import { BRIEF_TIMELINE_MAX_FLIGHTS, timelineFlights } from '../../app/planner';
import demo from '../../data/demo-plan.json';

const entry = (time: string, a: number, b: number): TimelineEntry => ({
  time,
  sites: [
    {
      id: 'a',
      pHit: a,
      pHitSE: 0.02,
      variant: 'v',
      meetsRequired: a >= 0.9,
      byVariant: [{ variant: 'v', pHit: a, pHitSE: 0.02 }],
    },
    {
      id: 'b<x>',
      pHit: b,
      pHitSE: 0.02,
      variant: 'v',
      meetsRequired: b >= 0.9,
      byVariant: [{ variant: 'v', pHit: b, pHitSE: 0.02 }],
    },
  ],
});

describe('the release-time timeline plot', () => {
  const tl = [
    entry('2026-12-01T08:00:00Z', 0.95, 0.2),
    entry('2026-12-01T08:15:00Z', 0.91, 0.5),
    entry('2026-12-01T08:30:00Z', 0.4, 0.92),
  ];
  const svg = timelineSvg(tl, 0.9);

  it('draws one cell per site and time, green exactly where P(hit) meets the requirement', () => {
    expect(svg.match(/<rect class="(ok|no)"/g)?.length).toBe(6);
    // a: 0.95, 0.91 ok, 0.40 not; b: 0.20, 0.50 not, 0.92 ok (threshold 0.9, common practice ≥).
    expect(svg.match(/<rect class="ok" data-site="a"/g)?.length).toBe(2);
    expect(svg.match(/<rect class="ok" data-site="b&lt;x&gt;"/g)?.length).toBe(1);
  });

  it('cells tile the span without gaps or overlaps along each row', () => {
    const xs = [...svg.matchAll(/data-site="a" x="([\d.]+)" y="[\d.]+" width="([\d.]+)"/g)].map(
      (m) => [Number(m[1]), Number(m[2])],
    );
    for (let i = 1; i < xs.length; i++)
      expect(xs[i][0]).toBeCloseTo(xs[i - 1][0] + xs[i - 1][1], 0);
  });

  it('each cell names P(hit) with its Monte Carlo standard error', () => {
    // pHitSE 0.02 in every entry above; √(p(1−p)/n) is the binomial standard error (common practice).
    expect(svg).toContain('P(hit) 0.95 ± 0.02 (v)');
  });

  it('escapes site ids and says when there is nothing to draw', () => {
    expect(svg).not.toContain('b<x>');
    expect(timelineSvg([tl[0]], 0.9)).toContain('at least two forecast times');
  });
});

describe('the brief’s timeline budget', () => {
  const plan = resolvePlan(demo as unknown as PlanFile, { now: new Date('2026-12-01T08:00:00Z') });

  it('counts the descents a timeline flies: times × sites × variants × samples', () => {
    // The demo's own winds at 09:30+01:00 and one forecast at 13:00+01:00: 3.5 h every 15 min is
    // 15 times; 12 sites, 3 variants, min(2000, 200) samples (arithmetic, common practice).
    expect(timelineFlights(plan, 900)).toBe(15 * 12 * 3 * 200);
    expect(timelineFlights(plan, 900)).toBeLessThanOrEqual(BRIEF_TIMELINE_MAX_FLIGHTS);
  });

  it('a brief that leaves the timeline out says why, as text', () => {
    const html = timelineSection(plan, undefined, { omitted: 'Left out: <too many> descents' });
    expect(html).toContain('Release-time timeline');
    expect(html).toContain('Left out: &lt;too many&gt; descents');
    expect(timelineSection(plan, undefined)).toBe('');
  });
});
