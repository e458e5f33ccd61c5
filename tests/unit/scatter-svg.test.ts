import { XMLParser, XMLValidator } from 'fast-xml-parser';
import { describe, expect, it } from 'vitest';
import { fallProfileSvg, scatterSvg } from '../../app/brief';
import { siteSamples } from '../../app/planner';
import { validatePlan } from '../../app/plan/validate';
import demo from '../../data/demo-plan.json';
import { expectClose } from './helpers';

type Node = Record<string, unknown>;
const parser = new XMLParser({ ignoreAttributes: false, attributeNamePrefix: '' });
const asList = (x: unknown): Node[] =>
  (x === undefined ? [] : Array.isArray(x) ? x : [x]) as Node[];
const viewBox = (svg: Node): number[] => String(svg.viewBox).split(' ').map(Number);

function demoSamples(site = 's01', variant = 'plain-drifter') {
  const v = validatePlan(structuredClone(demo));
  if (!v.ok) throw new Error('demo plan');
  return siteSamples(v.plan, site, variant)!;
}

/** Scale of a drawing from two of its grid lines: px per metre (the labels' own numbers). */
function pxPerMetre(lines: Node[], axis: 'east' | 'north'): number {
  const g = lines.filter((l) => l['data-axis'] === axis);
  expect(g.length).toBeGreaterThanOrEqual(2);
  const pos = (l: Node): number => Number(axis === 'east' ? l.x1 : l.y1);
  const [a, b] = [g[0], g[g.length - 1]];
  return Math.abs(pos(b) - pos(a)) / Math.abs(Number(b['data-m']) - Number(a['data-m']));
}

describe('the landing scatter', () => {
  const s = demoSamples();
  const svgText = scatterSvg(s, { title: 's01 / plain-drifter' });
  const svg = parser.parse(svgText).svg as Node;

  it('is well-formed XML (fast-xml-parser XMLValidator) with every landing inside the viewBox', () => {
    expect(XMLValidator.validate(svgText)).toBe(true);
    const [x0, y0, w, h] = viewBox(svg);
    const pts = asList(svg.circle).filter((c) => String(c.class).startsWith('pt'));
    expect(pts.length).toBe(s.east_m.length);
    for (const c of pts) {
      const [cx, cy] = [Number(c.cx), Number(c.cy)];
      expect(cx).toBeGreaterThanOrEqual(x0);
      expect(cx).toBeLessThanOrEqual(x0 + w);
      expect(cy).toBeGreaterThanOrEqual(y0);
      expect(cy).toBeLessThanOrEqual(y0 + h);
    }
  });

  it('draws the tolerance circle at the scale of the grid, and one scale both ways', () => {
    const lines = asList(svg.line);
    const kE = pxPerMetre(lines, 'east');
    const kN = pxPerMetre(lines, 'north');
    // Grid positions are rounded to 0.1 px; over ≥ 1 step the scale is good to about 1 %.
    expectClose(kN / kE, 1, 0.01, 'same scale east and north');
    const tol = asList(svg.circle).find((c) => c.class === 'tol')!;
    expectClose(Number(tol.r), s.tolerance_m * kE, 0.01 * s.tolerance_m * kE + 0.1, 'radius');
  });

  it('counts as hits exactly the landings inside the tolerance, the share the planner reports', () => {
    const hits = asList(svg.circle).filter((c) => c.class === 'pt hit').length;
    expect(hits / s.east_m.length).toBe(s.result.pHit);
  });

  it('draws both ellipses, the 95 % one √(ln 20 / ln 2) times the 50 % one', () => {
    const e = asList(svg.ellipse);
    const e50 = e.find((x) => x.class === 'e50')!;
    const e95 = e.find((x) => x.class === 'e95')!;
    // Hoover 1984: k = √(−2 ln(1 − P)); rounded to 0.1 px.
    expectClose(Number(e95.rx) / Number(e50.rx), Math.sqrt(Math.log(20) / Math.log(2)), 0.02);
  });

  it('turns the ellipse so its major axis lies along the azimuth (north up, east right)', () => {
    const e = { east_m: 0, north_m: 0, semiMajor_m: 50, semiMinor_m: 10, azimuth_deg: 30 };
    const text = scatterSvg({
      east_m: [],
      north_m: [],
      tolerance_m: 5,
      ellipse50: e,
      ellipse95: e,
    });
    const el = asList((parser.parse(text).svg as Node).ellipse)[0];
    const m = /rotate\(([-\d.]+) /.exec(String(el.transform))!;
    const th = (Number(m[1]) * Math.PI) / 180;
    // Screen y grows downward: the turned x axis (cos θ, sin θ) must point east-north-east at
    // azimuth 30° true, i.e. (sin 30°, −cos 30°) on screen (common practice: azimuth from north,
    // clockwise).
    expectClose(Math.cos(th), Math.sin(Math.PI / 6), 1e-3);
    expectClose(Math.sin(th), -Math.cos(Math.PI / 6), 1e-3);
  });

  it('draws at most maxPoints landings, thinned evenly, and says how many of how many', () => {
    const text = scatterSvg(s, { maxPoints: 300 });
    const pts = asList((parser.parse(text).svg as Node).circle).filter((c) =>
      String(c.class).startsWith('pt'),
    );
    expect(pts.length).toBe(300);
    expect(text).toContain(`300 of ${s.east_m.length} landings`);
  });

  it('keeps the frame on the bulk of the landings and puts a far one on its edge, counted', () => {
    const e = { east_m: 0, north_m: 0, semiMajor_m: 5, semiMinor_m: 5, azimuth_deg: 0 };
    const east = Array.from({ length: 400 }, (_, i) => ((i % 20) - 10) / 2);
    const north = Array.from({ length: 400 }, (_, i) => (Math.floor(i / 20) - 10) / 2);
    east[7] = 5000; // one landing 5 km east
    const text = scatterSvg({
      east_m: east,
      north_m: north,
      tolerance_m: 3,
      ellipse50: e,
      ellipse95: e,
    });
    expect(XMLValidator.validate(text)).toBe(true);
    const root = parser.parse(text).svg as Node;
    const out = asList(root.circle).filter((c) => c.class === 'pt out');
    expect(out.length).toBe(1);
    const frame = asList(root.rect)[0];
    expectClose(Number(out[0].cx), Number(frame.x) + Number(frame.width), 0.1, 'on the right edge');
    expect(text).toContain('red: 1 beyond, on the edge');
    // The tolerance circle stays large: the frame spans the ±5 m cloud, not the 5 km outlier.
    const tol = asList(root.circle).find((c) => c.class === 'tol')!;
    expect(Number(tol.r)).toBeGreaterThan(Number(frame.width) / 8);
  });

  it('escapes a hostile caption and unit label', () => {
    const text = scatterSvg(s, {
      title: `<script>alert("x")</script> & 'co'`,
      unit: { label: '<b>', perMetre: 1 },
    });
    expect(XMLValidator.validate(text)).toBe(true);
    expect(text).not.toContain('<script');
    expect(text).not.toContain('<b>');
    expect(text).toContain('&lt;script&gt;alert(&quot;x&quot;)&lt;/script&gt; &amp; &#39;co&#39;');
  });

  it('labels the grid in feet when asked, at the same drawing scale', () => {
    // 1 ft = 0.3048 m exactly (international foot, 1959).
    const ft = scatterSvg(s, { unit: { label: 'ft', perMetre: 1 / 0.3048 } });
    expect(XMLValidator.validate(ft)).toBe(true);
    expect(ft).toContain('ft north / east of the site');
    const tol = asList((parser.parse(ft).svg as Node).circle).find((c) => c.class === 'tol')!;
    const tolM = asList(svg.circle).find((c) => c.class === 'tol')!;
    expect(tol.r).toBe(tolM.r);
  });
});

describe('the fall profile drawing', () => {
  const s = demoSamples('s01', 'vane-steer');
  const text = fallProfileSvg(s.profile, { title: 'vane-steer' });
  const svg = parser.parse(text).svg as Node;

  it('is well-formed XML with both lines inside the viewBox, time and height axes labelled with units', () => {
    expect(XMLValidator.validate(text)).toBe(true);
    const [x0, y0, w, h] = viewBox(svg);
    const lines = asList(svg.polyline);
    expect(lines.map((l) => l.class)).toEqual(['line time', 'line drift']);
    for (const l of lines) {
      const pts = String(l.points)
        .split(' ')
        .map((p) => p.split(',').map(Number));
      expect(pts.length).toBe(s.profile.time_s.length);
      for (const [x, y] of pts) {
        expect(x).toBeGreaterThanOrEqual(x0);
        expect(x).toBeLessThanOrEqual(x0 + w);
        expect(y).toBeGreaterThanOrEqual(y0);
        expect(y).toBeLessThanOrEqual(y0 + h);
      }
    }
    expect(text).toContain('time from release, s');
    expect(text).toContain('height above ground, m');
    expect(text).toContain('wind drift, m');
  });

  it('starts at the top left (release) and ends on the ground axis at the fall time', () => {
    const pts = String(asList(svg.polyline)[0].points)
      .split(' ')
      .map((p) => p.split(',').map(Number));
    const ys = pts.map((p) => p[1]);
    expect(Math.min(...ys)).toBe(ys[0]);
    expect(Math.max(...ys)).toBe(ys[ys.length - 1]);
    const xs = pts.map((p) => p[0]);
    expect(xs).toEqual([...xs].sort((a, b) => a - b));
    // The caption rounds the fall time to 0.1 s.
    expect(text).toContain(`fall ${Math.round(s.result.fallTime_s * 10) / 10} s`);
  });

  it('copes with nothing to draw and escapes its caption', () => {
    const empty = fallProfileSvg(
      { time_s: [], height_m: [], driftEast_m: [], driftNorth_m: [] },
      { title: '<img src=x>' },
    );
    expect(XMLValidator.validate(empty)).toBe(true);
    expect(empty).toContain('no fall to draw');
    expect(empty).not.toContain('<img');
  });
});
