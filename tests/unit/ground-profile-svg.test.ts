import { XMLParser, XMLValidator } from 'fast-xml-parser';
import { describe, expect, it } from 'vitest';
import { groundProfileSvg } from '../../app/brief';
import type { FallProfilePoint } from '../../app/planner';
import { expectClose } from './helpers';

type Node = Record<string, unknown>;
const parser = new XMLParser({ ignoreAttributes: false, attributeNamePrefix: '' });
const asList = (x: unknown): Node[] =>
  (x === undefined ? [] : Array.isArray(x) ? x : [x]) as Node[];
const pairs = (s: unknown): number[][] =>
  String(s)
    .trim()
    .split(' ')
    .map((p) => p.split(',').map(Number));

/** A straight descent from 1,000 m to 200 m over 500 m of ground rising from 100 m to 200 m. */
function slope(n = 51, gap?: [number, number]): FallProfilePoint[] {
  return Array.from({ length: n }, (_, i) => {
    const d = (500 * i) / (n - 1);
    const ground = 100 + 0.2 * d;
    const hole = gap && d > gap[0] && d < gap[1];
    return { dist_m: d, alt_m: 1000 - 1.6 * d, ground_m: hole ? null : ground };
  });
}

/** Screen position against axis value from two labelled grid lines (the drawing's own labels). */
function axisMap(lines: Node[], axis: 'alt' | 'dist'): (v: number) => number {
  const g = lines.filter((l) => l['data-axis'] === axis);
  expect(g.length).toBeGreaterThanOrEqual(2);
  const pos = (l: Node): number => Number(axis === 'dist' ? l.x1 : l.y1);
  const [a, b] = [g[0], g[g.length - 1]];
  const va = Number(a['data-v']);
  const vb = Number(b['data-v']);
  return (v) => pos(a) + ((v - va) / (vb - va)) * (pos(b) - pos(a));
}

describe('the ground profile drawing', () => {
  const text = groundProfileSvg(slope(), {
    title: 's01 / vane-steer',
    site: { dist_m: 480, elevation_m: 196 },
  });
  const svg = parser.parse(text).svg as Node;

  it('is well-formed XML with the path, ground and site inside the viewBox', () => {
    expect(XMLValidator.validate(text)).toBe(true);
    const [x0, y0, w, h] = String(svg.viewBox).split(' ').map(Number);
    const inside = ([x, y]: number[]): void => {
      expect(x).toBeGreaterThanOrEqual(x0);
      expect(x).toBeLessThanOrEqual(x0 + w);
      expect(y).toBeGreaterThanOrEqual(y0);
      expect(y).toBeLessThanOrEqual(y0 + h);
    };
    pairs((asList(svg.polyline)[0] as Node).points).forEach(inside);
    asList(svg.polygon).forEach((p) => pairs(p.points).forEach(inside));
    expect(text).toContain('altitude MSL, m');
    expect(text).toContain('distance from release, m');
  });

  it('puts the landing and the ground at the heights and distances its axis labels say', () => {
    const lines = asList(svg.line);
    const X = axisMap(lines, 'dist');
    const Y = axisMap(lines, 'alt');
    // The descent ends at 500 m from release, 200 m MSL (the input's last point, by construction).
    const landing = asList(svg.circle).find((c) => c.class === 'landing')!;
    expectClose(Number(landing.cx), X(500), 0.15, 'landing x');
    expectClose(Number(landing.cy), Y(200), 0.15, 'landing y');
    // The ground's top edge follows 100 + 0.2·d (its own input), to the 0.1 px rounding.
    const ground = pairs(asList(svg.polygon)[0].points).slice(1, -1);
    expect(ground.length).toBe(51);
    for (const [i, [x, y]] of ground.entries()) {
      const d = (500 * i) / 50;
      expectClose(x, X(d), 0.15, `ground x ${i}`);
      expectClose(y, Y(100 + 0.2 * d), 0.15, `ground y ${i}`);
    }
    // Ticks are nice numbers (1, 2 or 5 × a power of ten apart) covering every height drawn.
    const alt = lines.filter((l) => l['data-axis'] === 'alt').map((l) => Number(l['data-v']));
    const step = alt[1] - alt[0];
    expect([100, 200, 500]).toContain(step); // common practice: 1-2-5 axis steps
    expect(Math.min(...alt)).toBeLessThanOrEqual(100);
    expect(Math.max(...alt)).toBeGreaterThanOrEqual(1000);
    const site = asList(svg.line).find((l) => l.class === 'site-level')!;
    expectClose(Number(site.y1), Y(196), 0.15, 'site level');
    expect(text).toContain('meets the ground at 200 m MSL, 500 m from release');
  });

  it('labels the axes in the display unit (feet: 0.3048 m exactly, by definition)', () => {
    const ft = { label: 'ft', perMetre: 1 / 0.3048 };
    const t = groundProfileSvg(slope(), { unit: ft });
    const s = parser.parse(t).svg as Node;
    expect(t).toContain('altitude MSL, ft');
    expect(t).toContain('distance from release, ft');
    const Y = axisMap(asList(s.line), 'alt');
    const landing = asList(s.circle).find((c) => c.class === 'landing')!;
    expectClose(Number(landing.cy), Y(200 / 0.3048), 0.15, 'landing at 656 ft');
    expect(t).toContain(`meets the ground at ${Math.round(200 / 0.3048)} ft MSL`);
  });

  it('leaves a gap in the ground where the model has no height', () => {
    const t = groundProfileSvg(slope(51, [195, 305]));
    const s = parser.parse(t).svg as Node;
    const polys = asList(s.polygon).filter((p) => p.class === 'ground');
    expect(polys.length).toBe(2);
    // Points at 0..190 m (20) and 310..500 m (20), each closed down to the axis with 2 more.
    expect(polys.map((p) => pairs(p.points).length)).toEqual([22, 22]);
    expect(t).toContain('gaps: no ground known');
    const none = groundProfileSvg(slope().map((p) => ({ ...p, ground_m: null })));
    expect(asList((parser.parse(none).svg as Node).polygon).length).toBe(0);
    expect(none).toContain('ends over no known ground');
  });

  it('escapes a hostile title and unit label, and copes with nothing to draw', () => {
    const evil = '<script>alert(1)</script>"&\'';
    const t = groundProfileSvg(slope(), {
      title: evil,
      unit: { label: '<b>m</b>', perMetre: 1 },
    });
    expect(XMLValidator.validate(t)).toBe(true);
    expect(t).not.toContain('<script');
    expect(t).not.toContain('<b>');
    expect(t).toContain('&lt;script&gt;');
    const empty = groundProfileSvg([], { title: evil });
    expect(XMLValidator.validate(empty)).toBe(true);
    expect(empty).toContain('no descent to draw');
    expect(empty).not.toContain('<script');
  });

  it('stays bounded with a huge or broken profile', () => {
    const many: FallProfilePoint[] = Array.from({ length: 200_000 }, (_, i) => ({
      dist_m: i,
      alt_m: 1e5 - i / 2,
      ground_m: i % 7 === 0 ? null : 0,
    }));
    const t = groundProfileSvg(many, { width_px: 1e9, height_px: -5 });
    expect(t.length).toBeLessThan(200_000);
    const s = parser.parse(t).svg as Node;
    expect(pairs((asList(s.polyline)[0] as Node).points).length).toBeLessThanOrEqual(400);
    const [, , w, h] = String(s.viewBox).split(' ').map(Number);
    expect(w).toBeLessThanOrEqual(2000);
    expect(h).toBeGreaterThanOrEqual(160);
    const broken = [
      { dist_m: NaN, alt_m: 5, ground_m: 0 },
      { dist_m: 1, alt_m: Infinity, ground_m: 0 },
      { dist_m: 0, alt_m: 100, ground_m: 0 },
      { dist_m: 50, alt_m: 0, ground_m: 0 },
    ];
    const b = groundProfileSvg(broken);
    expect(XMLValidator.validate(b)).toBe(true);
    expect(b).not.toContain('NaN');
    expect(b).not.toContain('Infinity');
  });
});
