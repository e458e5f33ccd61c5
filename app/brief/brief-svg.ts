/**
 * SVG drawings for the printed brief, as strings (no DOM): the overview map in the plan's local
 * metric frame and the wind profile plot. Print-friendly: white background, dark lines, no tiles.
 */
import { type LatLon, LocalFrame, windFromComponents } from '../model';
import { type Plan, planWindProfile } from '../plan';
import type { PlanResult } from '../planner';

/** Escapes text for HTML and SVG. */
export function esc(text: unknown): string {
  return String(text ?? '')
    .replace(/&/g, '&amp;')
    .replace(/</g, '&lt;')
    .replace(/>/g, '&gt;')
    .replace(/"/g, '&quot;')
    .replace(/'/g, '&#39;');
}

/** Our own print colours for variants, in catalogue order. */
export const PRINT_COLOURS = ['#0f766e', '#b45309', '#7c3aed', '#be123c', '#1d4ed8', '#4d7c0f'];

const DEG = Math.PI / 180;
const r1 = (v: number): string => (Math.round(v * 10) / 10).toString();

/**
 * A drawing W px wide of local metres (x east, y north up) holding `pts`: their box grown on every
 * side by padFrac of its larger side (at least 50 m), centred, one scale both ways. `height` is
 * the drawing's height in px, or a function of the padded box's width and height in metres.
 */
export function fitView(
  pts: readonly XY[],
  W: number,
  padFrac: number,
  height: number | ((w_m: number, h_m: number) => number),
): {
  H: number;
  scale: number;
  cx: number;
  cy: number;
  tx: (x: number) => number;
  ty: (y: number) => number;
} {
  let minX = Math.min(...pts.map((p) => p.x));
  let maxX = Math.max(...pts.map((p) => p.x));
  let minY = Math.min(...pts.map((p) => p.y));
  let maxY = Math.max(...pts.map((p) => p.y));
  const pad = padFrac * Math.max(maxX - minX, maxY - minY, 50);
  const H =
    typeof height === 'number' ? height : height(maxX - minX + 2 * pad, maxY - minY + 2 * pad);
  minX -= pad;
  maxX += pad;
  minY -= pad;
  maxY += pad;
  const scale = Math.min(W / (maxX - minX), H / (maxY - minY));
  const cx = (minX + maxX) / 2;
  const cy = (minY + maxY) / 2;
  return {
    H,
    scale,
    cx,
    cy,
    tx: (x) => W / 2 + (x - cx) * scale,
    ty: (y) => H / 2 - (y - cy) * scale,
  };
}

interface XY {
  x: number;
  y: number;
}

function ellipsePts(c: XY, a: number, b: number, azDeg: number, n = 48): XY[] {
  const s = Math.sin(azDeg * DEG);
  const co = Math.cos(azDeg * DEG);
  const out: XY[] = [];
  for (let k = 0; k < n; k++) {
    const t = (2 * Math.PI * k) / n;
    const u = a * Math.cos(t);
    const v = b * Math.sin(t);
    out.push({ x: c.x + u * s + v * co, y: c.y + u * co - v * s });
  }
  return out;
}

/** A "nice" step (1, 2 or 5 × 10^k) giving about `target` steps over span. */
export function niceStep(span: number, target = 6): number {
  const raw = span / target;
  const p = Math.pow(10, Math.floor(Math.log10(raw)));
  const m = raw / p;
  return (m < 1.5 ? 1 : m < 3.5 ? 2 : m < 7.5 ? 5 : 10) * p;
}

export interface OverviewOptions {
  width_px?: number;
  height_px?: number;
  /** Hazard area rings ([lat, lon] pairs) to outline, if computed. */
  hazardRings?: [number, number][][];
  /** No-drop zones: a name and outer rings ([lat, lon] pairs) each. */
  zones?: { name: string; rings: [number, number][][] }[];
}

/** Overview map of the plan: sites, chosen variants' reach, 95 % ellipses, windows or zones. */
export function overviewSvg(plan: Plan, result: PlanResult, opts: OverviewOptions = {}): string {
  const W = opts.width_px ?? 700;
  const H = opts.height_px ?? 520;
  const frame = new LocalFrame(result.releasePoint);
  const L = (p: LatLon): XY => frame.toLocal(p);
  const colourOf = (id: string): string =>
    PRINT_COLOURS[
      Math.max(
        0,
        plan.variants.findIndex((v) => v.id === id),
      ) % PRINT_COLOURS.length
    ];

  const shapes: string[] = [];
  const pts: XY[] = [{ x: 0, y: 0 }];
  const track = result.track;
  const moving = track.groundSpeed_mps > 0;
  const u = track.unit;
  const winSegs: { a: XY; b: XY; c: string; id: string }[] = [];
  for (const s of result.sites) {
    const site = L(s);
    pts.push(site);
    const e = s.ellipse95;
    const ell = ellipsePts(L(e.center), e.semiMajor_m, e.semiMinor_m, e.azimuth_deg);
    pts.push(...ell);
    const c = colourOf(s.variant);
    if (s.reachRadius_m > 0) {
      const rc = L(s.nominalLanding);
      pts.push({ x: rc.x - s.reachRadius_m, y: rc.y - s.reachRadius_m });
      pts.push({ x: rc.x + s.reachRadius_m, y: rc.y + s.reachRadius_m });
      shapes.push(
        `<circle class="reach" data-site="${esc(s.id)}" cx="${r1(rc.x)}" cy="${r1(rc.y)}" r="${r1(s.reachRadius_m)}" stroke="${c}"/>`,
      );
    }
    shapes.push(
      `<polygon class="e95" points="${ell.map((p) => `${r1(p.x)},${r1(p.y)}`).join(' ')}" stroke="${c}" fill="${c}"/>`,
    );
    if (moving && s.releaseWindow) {
      const v = track.groundSpeed_mps;
      const a = { x: u.x * v * s.releaseWindow.open_s, y: u.y * v * s.releaseWindow.open_s };
      const b = { x: u.x * v * s.releaseWindow.close_s, y: u.y * v * s.releaseWindow.close_s };
      pts.push(a, b);
      winSegs.push({ a, b, c, id: s.id });
    }
    if (s.releaseZone) {
      const z = L(s.releaseZone.center);
      const r = s.releaseZone.radius_m;
      pts.push({ x: z.x - r, y: z.y - r }, { x: z.x + r, y: z.y + r });
      shapes.push(
        `<circle class="zone" cx="${r1(z.x)}" cy="${r1(z.y)}" r="${r1(r)}" stroke="${c}"/>`,
      );
    }
  }
  for (const ring of opts.hazardRings ?? []) {
    const rp = ring.map(([lat, lon]) => L({ lat, lon }));
    pts.push(...rp);
    shapes.unshift(
      `<polygon class="hazard" points="${rp.map((p) => `${r1(p.x)},${r1(p.y)}`).join(' ')}"/>`,
    );
  }

  const zoneLabels: { at: XY; name: string }[] = [];
  for (const z of opts.zones ?? []) {
    for (const ring of z.rings) {
      const rp = ring.map(([lat, lon]) => L({ lat, lon }));
      // Not in the view's extent: a wide zone must not shrink the sites; the SVG clips it.
      if (rp.length < 3) continue;
      shapes.unshift(
        `<polygon class="nodrop" points="${rp.map((p) => `${r1(p.x)},${r1(p.y)}`).join(' ')}"/>`,
      );
      // The name at the ring's highest corner, where it least covers the zone's own area.
      zoneLabels.push({ at: rp.reduce((a, b) => (b.y > a.y ? b : a)), name: z.name });
    }
  }

  const { scale, cx, cy, tx, ty } = fitView(pts, W, 0.08, H);
  const halfW = W / 2 / scale;
  const halfH = H / 2 / scale;

  // Grid in metres from the release point.
  const step = niceStep(Math.max(2 * halfW, 2 * halfH), 7);
  const grid: string[] = [];
  for (let gx = Math.ceil((cx - halfW) / step) * step; gx <= cx + halfW; gx += step) {
    grid.push(`<line x1="${r1(tx(gx))}" y1="0" x2="${r1(tx(gx))}" y2="${H}"/>`);
    grid.push(`<text class="gl" x="${r1(tx(gx) + 2)}" y="${H - 4}">${Math.round(gx)}</text>`);
  }
  for (let gy = Math.ceil((cy - halfH) / step) * step; gy <= cy + halfH; gy += step) {
    grid.push(`<line x1="0" y1="${r1(ty(gy))}" x2="${W}" y2="${r1(ty(gy))}"/>`);
    grid.push(`<text class="gl" x="3" y="${r1(ty(gy) - 2)}">${Math.round(gy)}</text>`);
  }

  // Track line across the view.
  const reachT = 2 * Math.hypot(halfW, halfH) + Math.hypot(cx, cy);
  const trackLine =
    moving || track.trackDeg !== undefined
      ? `<line class="track" x1="${r1(tx(-u.x * reachT))}" y1="${r1(ty(-u.y * reachT))}" x2="${r1(tx(u.x * reachT))}" y2="${r1(ty(u.y * reachT))}"/>`
      : '';
  const wins = winSegs
    .map(
      (w) =>
        `<line class="win" x1="${r1(tx(w.a.x))}" y1="${r1(ty(w.a.y))}" x2="${r1(tx(w.b.x))}" y2="${r1(ty(w.b.y))}" stroke="${w.c}"/>`,
    )
    .join('');
  const siteMarks = result.sites
    .map((s) => {
      const p = L(s);
      const bad = !s.meetsRequired;
      return (
        `<g class="site"><circle cx="${r1(tx(p.x))}" cy="${r1(ty(p.y))}" r="5" class="${bad ? 'bad' : 'ok'}"/>` +
        `<text x="${r1(tx(p.x) + 7)}" y="${r1(ty(p.y) - 6)}">${esc(s.id)}</text></g>`
      );
    })
    .join('');
  const zoneNames = zoneLabels
    .map(
      (z) =>
        `<text class="zn" x="${r1(Math.min(W - 4, Math.max(4, tx(z.at.x))))}" y="${r1(Math.min(H - 30, Math.max(28, ty(z.at.y) - 4)))}"${tx(z.at.x) > W / 2 ? ' text-anchor="end"' : ''}>${esc(z.name.length > 40 ? `${z.name.slice(0, 39)}…` : z.name)}</text>`,
    )
    .join('');
  const rx = tx(0);
  const ry = ty(0);
  const release = `<path class="release" d="M${r1(rx)},${r1(ry - 9)} L${r1(rx + 9)},${r1(ry)} L${r1(rx)},${r1(ry + 9)} L${r1(rx - 9)},${r1(ry)} Z"/>`;
  // Scale bar: a nice length about a fifth of the width.
  const bar = niceStep(W / scale, 5);
  const scaleBar =
    `<g class="scale" transform="translate(${W - 20 - bar * scale},${H - 22})">` +
    `<rect width="${r1(bar * scale)}" height="6"/><text x="0" y="-4">0</text>` +
    `<text x="${r1(bar * scale)}" y="-4" text-anchor="end">${bar} m</text></g>`;
  const north = `<g class="north" transform="translate(${W - 28},34)"><path d="M0,-22 L8,6 L0,0 L-8,6 Z"/><text y="20" text-anchor="middle">N</text></g>`;
  const inner = shapes.map((sh) => sh).join('');
  return `<svg class="overview" xmlns="http://www.w3.org/2000/svg" viewBox="0 0 ${W} ${H}" width="${W}" height="${H}" role="img" aria-label="Overview map">
<style>
.overview{background:#fff;font:11px 'DejaVu Sans',system-ui,sans-serif}
.overview .grid line{stroke:#d0d4d2;stroke-width:0.7}
.overview .gl{fill:#7a827f;font-size:9px}
.overview .track{stroke:#222;stroke-width:1.2;stroke-dasharray:8 5}
.overview .win{stroke-width:7;stroke-opacity:0.55}
.overview .reach{fill:none;stroke-width:1.2;stroke-dasharray:6 4;vector-effect:non-scaling-stroke}
.overview .zone{fill:none;stroke-width:1.5;stroke-dasharray:2 4;vector-effect:non-scaling-stroke}
.overview .e95{fill-opacity:0.12;stroke-width:1.2;vector-effect:non-scaling-stroke}
.overview .hazard{fill:#d92d20;fill-opacity:0.06;stroke:#b42318;stroke-width:1.5;stroke-dasharray:10 3 2 3;vector-effect:non-scaling-stroke}
.overview .nodrop{fill:#555;fill-opacity:0.28;stroke:#222;stroke-width:1.2;vector-effect:non-scaling-stroke}
.overview .zn{font-size:10px;font-style:italic;fill:#222;paint-order:stroke;stroke:#fff;stroke-width:3px}
.overview .site circle{fill:#fff;stroke-width:2.5}
.overview .site .ok{stroke:#1a7f37}.overview .site .bad{stroke:#b42318}
.overview .site text{font-weight:700;font-size:11px;paint-order:stroke;stroke:#fff;stroke-width:3px}
.overview .release{fill:#1c2b27;stroke:#fff;stroke-width:1.5}
.overview .scale rect{fill:#1c2b27}.overview .north path{fill:#1c2b27}
</style>
<rect width="${W}" height="${H}" fill="#fff"/>
<g class="grid">${grid.join('')}</g>
${trackLine}
<g transform="matrix(${scale},0,0,${-scale},${W / 2 - cx * scale},${H / 2 + cy * scale})">${inner}</g>
${wins}${zoneNames}${release}${siteMarks}${scaleBar}${north}
<text x="6" y="14" class="gl">grid: metres east/north of the release point</text>
</svg>`;
}

/** Wind speed and direction against altitude, with the release altitude marked. */
export function windPlotSvg(
  plan: Plan,
  result: PlanResult,
  width_px = 520,
  height_px = 260,
): string {
  const ground = plan.groundElevation_m;
  const wind = planWindProfile(plan);
  const relAgl = result.releaseAltitudeMSL_m - ground;
  const layerAgl = plan.winds.layers.map((l) =>
    plan.winds.reference === 'AGL' ? l.altitude_m : l.altitude_m - ground,
  );
  // The fall happens below the release: show up to a little above it.
  const topAgl = Math.max(relAgl * 1.3, Math.min(...layerAgl, relAgl * 1.3), 50);
  const n = 60;
  const samples = Array.from({ length: n + 1 }, (_, i) => {
    const h = (topAgl * i) / n;
    const v = wind.at(ground + h);
    return { h, ...windFromComponents(v) };
  });
  const maxS = Math.max(5, ...samples.map((s) => s.speed_mps)) * 1.1;
  const padL = 46;
  const padB = 30;
  const gap = 30;
  const pw = (width_px - padL - gap - 10) / 2;
  const ph = height_px - padB - 16;
  const y = (h: number): number => 8 + ph - (h / topAgl) * ph;
  const xs = (s: number): number => padL + (s / maxS) * pw;
  const xd = (d: number): number => padL + pw + gap + (d / 360) * pw;
  const speedPath = samples
    .map((s, i) => `${i ? 'L' : 'M'}${r1(xs(s.speed_mps))},${r1(y(s.h))}`)
    .join(' ');
  const dirDots = samples
    .filter((s) => s.speed_mps > 0)
    .map((s) => `<circle cx="${r1(xd(s.fromDeg))}" cy="${r1(y(s.h))}" r="1.8"/>`)
    .join('');
  const hStep = niceStep(topAgl, 5);
  const sStep = niceStep(maxS, 4);
  const ticks: string[] = [];
  for (let h = 0; h <= topAgl; h += hStep) {
    ticks.push(
      `<line class="g" x1="${padL}" x2="${padL + 2 * pw + gap}" y1="${r1(y(h))}" y2="${r1(y(h))}"/>`,
    );
    ticks.push(
      `<text x="${padL - 4}" y="${r1(y(h) + 3)}" text-anchor="end">${Math.round(h)}</text>`,
    );
  }
  for (let s = 0; s <= maxS; s += sStep) {
    ticks.push(
      `<text x="${r1(xs(s))}" y="${height_px - padB + 14}" text-anchor="middle">${s}</text>`,
    );
  }
  for (const d of [0, 90, 180, 270, 360]) {
    ticks.push(
      `<text x="${r1(xd(d))}" y="${height_px - padB + 14}" text-anchor="middle">${d}</text>`,
    );
  }
  const layerMarks = layerAgl
    .filter((h) => h <= topAgl)
    .map(
      (h) => `<line class="lay" x1="${padL - 6}" x2="${padL}" y1="${r1(y(h))}" y2="${r1(y(h))}"/>`,
    )
    .join('');
  return `<svg class="windplot" xmlns="http://www.w3.org/2000/svg" viewBox="0 0 ${width_px} ${height_px}" width="${width_px}" height="${height_px}" role="img" aria-label="Wind profile">
<style>.windplot{font:10px 'DejaVu Sans',system-ui,sans-serif;background:#fff}.windplot .g{stroke:#dde2e0}
.windplot .sp{fill:none;stroke:#0f766e;stroke-width:2}.windplot circle{fill:#7c3aed}
.windplot .rel{stroke:#b42318;stroke-dasharray:5 3}.windplot .lay{stroke:#1c2b27;stroke-width:2}
.windplot .frame{fill:none;stroke:#8a9490}</style>
${ticks.join('')}
<rect class="frame" x="${padL}" y="8" width="${r1(pw)}" height="${ph}"/>
<rect class="frame" x="${r1(padL + pw + gap)}" y="8" width="${r1(pw)}" height="${ph}"/>
<path class="sp" d="${speedPath}"/>${dirDots}${layerMarks}
<line class="rel" x1="${padL}" x2="${r1(padL + 2 * pw + gap)}" y1="${r1(y(relAgl))}" y2="${r1(y(relAgl))}"/>
<text x="${r1(padL + 2 * pw + gap - 2)}" y="${r1(y(relAgl) - 3)}" text-anchor="end" fill="#b42318">release ${Math.round(relAgl)} m</text>
<text x="${r1(padL + pw / 2)}" y="${height_px - 3}" text-anchor="middle">speed, m/s</text>
<text x="${r1(padL + pw + gap + pw / 2)}" y="${height_px - 3}" text-anchor="middle">from, ° true</text>
<text transform="translate(10,${r1(8 + ph / 2)}) rotate(-90)" text-anchor="middle">m above plan ground</text>
</svg>`;
}
