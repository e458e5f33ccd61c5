import { describe, expect, it } from 'vitest';
import {
  planZone,
  timelineSection,
  timelineSvg,
  timelineWindows,
  UTC_ZONE,
  zoneClock,
  zoneClockText,
} from '../../app/brief';
import type { Plan } from '../../app/plan';
import type { TimelineEntry } from '../../app/planner';

const at = (iso: string): number => Date.parse(iso);

describe('the plan time zone read from plan.time', () => {
  // RFC 3339 §5.6: time-offset = "Z" / ("+" / "-") HH ":" MM; the offset is local minus UTC.
  it('reads +01:00, -05:30 and Z as written', () => {
    expect(planZone('2026-12-01T09:30:00+01:00')).toEqual({ offset_min: 60, label: 'UTC+01:00' });
    expect(planZone('2026-12-01T04:00:00-05:30')).toEqual({
      offset_min: -330,
      label: 'UTC-05:30',
    });
    expect(planZone('2026-12-01T09:30:00Z')).toEqual(UTC_ZONE);
  });

  it('reads the other forms the plan schema accepts and falls back to UTC otherwise', () => {
    // ISO 8601 basic and hour-only offsets; lower-case z and a space separator (RFC 3339 §5.6 note).
    expect(planZone('2026-12-01T09:30:00+0545').offset_min).toBe(345);
    expect(planZone('2026-12-01T09:30:00+01').offset_min).toBe(60);
    expect(planZone('2026-12-01 09:30:00.250-03:30').offset_min).toBe(-210);
    expect(planZone('2026-12-01t09:30:00z')).toEqual(UTC_ZONE);
    // RFC 3339 §4.3: "-00:00" says the local offset is unknown; UTC is the honest reading.
    expect(planZone('2026-12-01T09:30:00-00:00')).toEqual(UTC_ZONE);
    for (const bad of ['2026-12-01T09:30:00', 'not a time', '', '2026-12-01T09:30:00+25:00']) {
      expect(planZone(bad)).toEqual(UTC_ZONE);
    }
  });
});

describe('clock times in the plan zone with UTC beside them (hand values)', () => {
  const plus1 = planZone('2026-12-01T09:30:00+01:00');
  const minus530 = planZone('2026-12-01T04:00:00-05:30');
  it('+01:00: 09:15 UTC is 10:15 local', () => {
    expect(zoneClockText(at('2026-12-01T09:15:00Z'), plus1)).toBe('10:15 UTC+01:00 (09:15 UTC)');
  });
  it('-05:30: 02:00 UTC is 20:30 local on the day before', () => {
    expect(zoneClock(at('2026-12-01T02:00:00Z'), minus530)).toEqual({
      date: '2026-11-30',
      time: '20:30',
    });
    expect(zoneClockText(at('2026-12-01T02:00:00Z'), minus530, true)).toBe(
      '2026-11-30 20:30 UTC-05:30 (2026-12-01 02:00 UTC)',
    );
  });
  it('Z: one clock time, and seconds only when there are some', () => {
    expect(zoneClockText(at('2026-12-01T09:15:00Z'), UTC_ZONE)).toBe('09:15 UTC');
    expect(zoneClockText(at('2026-12-01T09:15:30Z'), UTC_ZONE)).toBe('09:15:30 UTC');
  });
});

const site = (id: string, pHit: number, variant = 'v') => ({
  id,
  pHit,
  pHitSE: 0.02,
  variant,
  meetsRequired: pHit >= 0.9,
  byVariant: [{ variant, pHit, pHitSE: 0.02 }],
});
/** Entries every 15 min from 08:00Z; P(hit) per site by entry. */
function timeline(rows: Record<string, number[]>, start = '2026-12-01T08:00:00Z'): TimelineEntry[] {
  const n = Object.values(rows)[0].length;
  return Array.from({ length: n }, (_, i) => ({
    time: new Date(at(start) + i * 900_000).toISOString(),
    sites: Object.entries(rows).map(([id, p]) => site(id, p[i])),
  }));
}
const texts = (svg: string, cls: string): { x: number; text: string }[] =>
  [...svg.matchAll(new RegExp(`<text class="${cls}" x="([\\d.]+)"[^>]*>([^<]*)</text>`, 'g'))].map(
    (m) => ({ x: Number(m[1]), text: m[2] }),
  );
const minutes = (hhmm: string): number => Number(hhmm.slice(0, 2)) * 60 + Number(hhmm.slice(3, 5));

describe('the timeline axis', () => {
  const tl = timeline({ a: [0.95, 0.91, 0.4, 0.3, 0.2], b: [0.2, 0.5, 0.92, 0.95, 0.97] });
  for (const [planTime, offset] of [
    ['2026-12-01T09:30:00+01:00', 60],
    ['2026-12-01T03:00:00-05:30', -330],
  ] as const) {
    it(`labels ticks in the plan zone (${planTime.slice(-6)}) with the same instants in UTC below`, () => {
      const zone = planZone(planTime);
      const svg = timelineSvg(tl, 0.9, { zone });
      const local = texts(svg, 't-local');
      const utc = texts(svg, 't-utc');
      expect(local.length).toBeGreaterThanOrEqual(3);
      expect(utc.map((u) => u.x)).toEqual(local.map((l) => l.x));
      for (let i = 0; i < local.length; i++) {
        // local = UTC + offset (mod one day), by the definition of the offset (RFC 3339 §5.6).
        expect((minutes(utc[i].text) + offset + 1440) % 1440).toBe(minutes(local[i].text));
      }
      // Ticks at round local times: 08:00Z…09:00Z is 09:00…10:00 at +01:00, 02:30…03:30 at -05:30.
      expect(local[0].text).toBe(offset === 60 ? '09:00' : '02:30');
      expect(svg).toContain(`>${zone.label}</text>`);
    });
  }

  it('keeps the last label: the tick at the last time is labelled, with half a label of room', () => {
    const svg = timelineSvg(tl, 0.9, { zone: planZone('2026-12-01T09:30:00+01:00') });
    const W = Number(/width="(\d+)"/.exec(svg)![1]);
    const local = texts(svg, 't-local');
    expect(local.at(-1)!.text).toBe('10:00');
    // "10:00" is 5 characters of at most ~0.64 em in DejaVu Sans at 10 px (from memory): ≤ 16 px each side.
    expect(W - local.at(-1)!.x).toBeGreaterThanOrEqual(16);
    for (const l of local) expect(l.x).toBeGreaterThanOrEqual(16);
  });

  it('says UTC alone when the plan time is in UTC', () => {
    const svg = timelineSvg(tl, 0.9, { zone: planZone('2026-12-01T09:30:00Z') });
    expect(texts(svg, 't-utc')).toEqual([]);
    expect(texts(svg, 't-local')[0].text).toBe('08:00');
  });
});

describe('the per-site window list', () => {
  const plan = {
    time: '2026-12-01T09:30:00+01:00',
    requiredPHit: 0.9,
  } as unknown as Plan;
  // a meets at 08:00 and 08:15Z; b from 08:30Z to the end; c never; d<script> twice.
  const tl = timeline({
    a: [0.95, 0.91, 0.4, 0.3, 0.2],
    b: [0.2, 0.5, 0.92, 0.95, 0.97],
    c: [0.1, 0.2, 0.3, 0.2, 0.1],
    'd<script>': [0.1, 0.95, 0.2, 0.93, 0.1],
  });

  it('gives each window its open and close clock time in the plan zone with UTC', () => {
    const w = timelineWindows(tl, 0.9, planZone(plan.time));
    expect(w.step_s).toBe(900);
    const a = w.sites.find((s) => s.id === 'a')!.windows;
    expect(a.map((x) => [x.openText, x.closeText, x.atStart, x.atEnd])).toEqual([
      ['09:00 UTC+01:00 (08:00 UTC)', '09:15 UTC+01:00 (08:15 UTC)', true, false],
    ]);
    const b = w.sites.find((s) => s.id === 'b')!.windows;
    expect(b.map((x) => [x.openText, x.closeText, x.atStart, x.atEnd])).toEqual([
      ['09:30 UTC+01:00 (08:30 UTC)', '10:00 UTC+01:00 (09:00 UTC)', false, true],
    ]);
    expect(w.sites.find((s) => s.id === 'c')!.windows).toEqual([]);
    expect(w.sites.find((s) => s.id === 'd<script>')!.windows.length).toBe(2);
  });

  it('the brief section lists every site, says when one has no window, and escapes ids', () => {
    const html = timelineSection(plan, tl);
    expect(html).toContain('<h2>Release-time timeline</h2>');
    expect(html).toContain('<svg class="timeline"');
    expect(html.match(/<tr data-site="/g)?.length).toBe(1 + 1 + 1 + 2);
    expect(html).toMatch(
      /<tr data-site="c"><td>c<\/td><td[^>]*>no evaluated time meets P\(hit\) ≥ 0\.9</,
    );
    expect(html).toContain(
      '<td>09:30 UTC+01:00 (08:30 UTC)</td><td>10:00 UTC+01:00 (09:00 UTC)</td>',
    );
    expect(html).not.toContain('<script>');
    expect(html).toContain('d&lt;script&gt;');
  });

  it('is empty without a timeline', () => {
    expect(timelineSection(plan, undefined)).toBe('');
    expect(timelineSection(plan, [])).toBe('');
  });
});
