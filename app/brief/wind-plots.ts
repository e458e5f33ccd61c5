/**
 * Wind and release-altitude plots as SVG strings (no DOM, print-friendly, escaped text): the
 * hodograph of the plan's wind profile and a P(hit)/CEP sweep over release altitude.
 */
import { esc, niceStep } from './brief-svg';
import { type Plan, planWindProfile } from '../plan';
import type { SweepPoint } from '../planner';

const r1 = (v: number): string => (Math.round(v * 10) / 10).toString();
const r3 = (v: number): string => (Math.round(v * 1000) / 1000).toString();

/** One vertex of the hodograph: the wind vector's tip (air moving toward) at a height. */
export interface HodographPoint {
  /** Height above the plan ground, m. */
  altitudeAGL_m: number;
  east_mps: number;
  north_mps: number;
  /** True when the vertex is a wind layer of the plan (dotted and labelled). */
  layer: boolean;
}

export interface HodographTrace {
  points: HodographPoint[];
  release: HodographPoint;
  top_m: number;
}

/**
 * Vertices of the hodograph from the ground to a little above the release (heights AGL, m).
 * The profile interpolates components linearly between layers and scales one direction by a
 * power law below the lowest layer (docs/model.md §2), so the straight polyline through these
 * vertices is the exact trace, not an approximation.
 */
export function hodographTrace(
  plan: Plan,
  opts: { releaseAltitudeMSL_m?: number } = {},
): HodographTrace {
  const ground = plan.groundElevation_m;
  const wind = planWindProfile(plan);
  const relMSL =
    opts.releaseAltitudeMSL_m ??
    plan.release.altitude_m + (plan.release.reference === 'AGL' ? ground : 0);
  const relAgl = Math.max(0, relMSL - ground);
  const top = Math.max(relAgl * 1.15, relAgl + 10);
  const at = (h: number, layer: boolean): HodographPoint => {
    const v = wind.at(ground + h);
    return { altitudeAGL_m: h, east_mps: v.east_mps, north_mps: v.north_mps, layer };
  };
  const layerAgl = Array.from(wind.z, (z) => z - ground).filter((h) => h >= 0 && h <= top);
  const heights = new Map<number, boolean>([
    [0, false],
    [top, false],
  ]);
  for (const h of layerAgl) heights.set(h, true);
  const points = [...heights.entries()].sort((a, b) => a[0] - b[0]).map(([h, l]) => at(h, l));
  return { points, release: at(relAgl, false), top_m: top };
}

export interface HodographOptions {
  width_px?: number;
  height_px?: number;
  /** Release altitude to mark, m MSL (default: the plan's release altitude). */
  releaseAltitudeMSL_m?: number;
}

/** Hodograph of the plan's wind (east/north components in m/s, heights in m AGL). */
export function hodographSvg(plan: Plan, opts: HodographOptions = {}): string {
  const W = opts.width_px ?? 380;
  const H = opts.height_px ?? 400;
  const { points, release, top_m } = hodographTrace(plan, opts);
  const maxS = Math.max(...points.map((p) => Math.hypot(p.east_mps, p.north_mps)));
  const step = niceStep(Math.max(maxS, 1), 3);
  const rings = Math.max(1, Math.ceil(maxS / step - 1e-9));
  const R = rings * step;
  const titleH = 34;
  const footH = 18;
  const cx = W / 2;
  const cy = titleH + (H - titleH - footH) / 2;
  const scale = (Math.min(W, H - titleH - footH) / 2 - 16) / R;
  const px = (e: number): number => cx + e * scale;
  const py = (n: number): number => cy - n * scale;

  const grid: string[] = [];
  for (let k = 1; k <= rings; k++) {
    const r = k * step * scale;
    grid.push(`<circle class="ring" cx="${r1(cx)}" cy="${r1(cy)}" r="${r1(r)}"/>`);
    grid.push(
      `<text class="rl" x="${r1(cx + r * Math.SQRT1_2 + 2)}" y="${r1(cy + r * Math.SQRT1_2 + 10)}">${r3(k * step)}${k === rings ? ' m/s' : ''}</text>`,
    );
  }
  const ext = R * scale + 6;
  grid.push(
    `<line class="ax" x1="${r1(cx - ext)}" y1="${r1(cy)}" x2="${r1(cx + ext)}" y2="${r1(cy)}"/>`,
  );
  grid.push(
    `<line class="ax" x1="${r1(cx)}" y1="${r1(cy - ext)}" x2="${r1(cx)}" y2="${r1(cy + ext)}"/>`,
  );
  grid.push(
    `<text class="dir" x="${r1(cx)}" y="${r1(cy - ext - 3)}" text-anchor="middle">N</text>`,
  );
  grid.push(`<text class="dir" x="${r1(cx + ext + 3)}" y="${r1(cy + 4)}">E</text>`);

  // The trace lives in a group whose user units are m/s (north up), so its numbers are the data.
  const trace = points.map((p) => `${r3(p.east_mps)},${r3(p.north_mps)}`).join(' ');
  const dotR = 3 / scale;
  const dots = points
    .filter((p) => p.layer)
    .map(
      (p) =>
        `<circle class="lay" data-alt="${r1(p.altitudeAGL_m)}" cx="${r3(p.east_mps)}" cy="${r3(p.north_mps)}" r="${r3(dotR)}"/>`,
    )
    .join('');
  const labels = points
    .filter((p) => p.layer)
    .map(
      (p) =>
        `<text class="al" x="${r1(px(p.east_mps) + 5)}" y="${r1(py(p.north_mps) - 4)}">${Math.round(p.altitudeAGL_m)} m</text>`,
    )
    .join('');
  const rx = px(release.east_mps);
  const ry = py(release.north_mps);
  const relMark =
    `<g class="rel" data-east="${r3(release.east_mps)}" data-north="${r3(release.north_mps)}">` +
    `<path d="M${r1(rx)},${r1(ry - 7)} L${r1(rx + 7)},${r1(ry)} L${r1(rx)},${r1(ry + 7)} L${r1(rx - 7)},${r1(ry)} Z"/>` +
    // Label on the centre side of the marker so it stays inside the drawing.
    `<text x="${r1(rx + (rx > cx ? -9 : 9))}" y="${r1(ry + 14)}" text-anchor="${rx > cx ? 'end' : 'start'}">release ${Math.round(release.altitudeAGL_m)} m</text></g>`;

  return `<svg class="hodograph" xmlns="http://www.w3.org/2000/svg" viewBox="0 0 ${W} ${H}" width="${W}" height="${H}" role="img" aria-label="Hodograph">
<style>.hodograph{font:10px 'DejaVu Sans',system-ui,sans-serif;background:#fff}
.hodograph .ring{fill:none;stroke:#d0d6d3}.hodograph .ax{stroke:#8a9490;stroke-width:0.8}
.hodograph .rl{fill:#6b7572;font-size:9px}.hodograph .dir{font-weight:700;fill:#1c2b27}
.hodograph .trace{fill:none;stroke:#0f766e;stroke-width:2;vector-effect:non-scaling-stroke;stroke-linejoin:round}
.hodograph .lay{fill:#0f766e}.hodograph .al{fill:#1c2b27;font-size:9px;paint-order:stroke;stroke:#fff;stroke-width:3px}
.hodograph .rel path{fill:#b42318;stroke:#fff;stroke-width:1.2}.hodograph .rel text{fill:#b42318}
.hodograph .t{font-weight:700;font-size:11px}</style>
<rect width="${W}" height="${H}" fill="#fff"/>
<text class="t" x="6" y="14">Hodograph: ${esc(plan.name)}</text>
<text x="6" y="27">wind vector tip (air moving toward), m/s; 0 to ${Math.round(top_m)} m above plan ground</text>
${grid.join('')}
<g transform="matrix(${r3(scale)},0,0,${r3(-scale)},${r1(cx)},${r1(cy)})"><polyline class="trace" points="${trace}"/>${dots}</g>
${labels}${relMark}
<text x="6" y="${H - 5}">rings: ${r3(step)} m/s apart; labels: layer height, m AGL</text>
</svg>`;
}

export interface SweepSvgOptions {
  width_px?: number;
  height_px?: number;
  /** Draws a dashed line at this P(hit) (0–1). */
  requiredPHit?: number;
  title?: string;
}

/** P(hit) (left axis) and CEP in m (right axis) against release altitude in m AGL. */
export function sweepSvg(points: readonly SweepPoint[], opts: SweepSvgOptions = {}): string {
  const W = opts.width_px ?? 520;
  const H = opts.height_px ?? 260;
  const title = opts.title ?? 'P(hit) and CEP against release altitude';
  const head =
    `<svg class="sweep" xmlns="http://www.w3.org/2000/svg" viewBox="0 0 ${W} ${H}" width="${W}" height="${H}" role="img" aria-label="${esc(title)}">\n` +
    `<style>.sweep{font:10px 'DejaVu Sans',system-ui,sans-serif;background:#fff}.sweep .g{stroke:#dde2e0}
.sweep .frame{fill:none;stroke:#8a9490}.sweep .t{font-weight:700;font-size:11px}
.sweep .phl{fill:none;stroke:#0f766e;stroke-width:2}.sweep .ph{fill:#0f766e;stroke:#0f766e;stroke-width:1.5}
.sweep .cepl{fill:none;stroke:#b45309;stroke-width:1.5}.sweep .cep{fill:#b45309}
.sweep .unreach{fill:#fff}.sweep .req{stroke:#b42318;stroke-dasharray:6 4}</style>\n` +
    `<rect width="${W}" height="${H}" fill="#fff"/>\n<text class="t" x="6" y="14">${esc(title)}</text>\n`;
  const pts = [...points]
    .filter((p) => Number.isFinite(p.altitude_m))
    .sort((a, b) => a.altitude_m - b.altitude_m);
  if (pts.length === 0) {
    return `${head}<text x="${W / 2}" y="${H / 2}" text-anchor="middle">no altitudes</text>\n</svg>`;
  }
  const padL = 42;
  const padR = 48;
  const padT = 24;
  const padB = 32;
  const pw = W - padL - padR;
  const ph = H - padT - padB;
  let aMin = pts[0].altitude_m;
  let aMax = pts[pts.length - 1].altitude_m;
  if (aMax - aMin < 1) {
    aMin -= 10;
    aMax += 10;
  }
  const cepMaxRaw = Math.max(1, ...pts.map((p) => (Number.isFinite(p.cep_m) ? p.cep_m : 0)));
  const cStep = niceStep(cepMaxRaw, 4);
  const cepMax = Math.ceil(cepMaxRaw / cStep - 1e-9) * cStep;
  const x = (a: number): number => padL + ((a - aMin) / (aMax - aMin)) * pw;
  const yP = (p: number): number => padT + (1 - Math.min(1, Math.max(0, p))) * ph;
  const yC = (c: number): number => padT + (1 - c / cepMax) * ph;

  const g: string[] = [];
  for (let k = 0; k <= 5; k++) {
    const p = k / 5;
    g.push(`<line class="g" x1="${padL}" x2="${padL + pw}" y1="${r1(yP(p))}" y2="${r1(yP(p))}"/>`);
    g.push(`<text x="${padL - 4}" y="${r1(yP(p) + 3)}" text-anchor="end">${p.toFixed(1)}</text>`);
  }
  for (let c = 0; c <= cepMax + 1e-9; c += cStep) {
    g.push(`<text x="${padL + pw + 4}" y="${r1(yC(c) + 3)}" fill="#b45309">${r3(c)}</text>`);
  }
  const aStep = niceStep(aMax - aMin, 6);
  for (let a = Math.ceil(aMin / aStep) * aStep; a <= aMax + 1e-9; a += aStep) {
    g.push(`<line class="g" x1="${r1(x(a))}" x2="${r1(x(a))}" y1="${padT}" y2="${padT + ph}"/>`);
    g.push(`<text x="${r1(x(a))}" y="${padT + ph + 13}" text-anchor="middle">${r3(a)}</text>`);
  }
  const line = (f: (p: SweepPoint) => number): string =>
    pts.map((p, i) => `${i ? 'L' : 'M'}${r1(x(p.altitude_m))},${r1(f(p))}`).join(' ');
  const cepOk = pts.filter((p) => Number.isFinite(p.cep_m));
  const phDots = pts
    .map(
      (p) =>
        `<circle class="ph${p.reachable ? '' : ' unreach'}" data-alt="${r3(p.altitude_m)}" cx="${r1(x(p.altitude_m))}" cy="${r1(yP(p.pHit))}" r="3"/>`,
    )
    .join('');
  const cepDots = cepOk
    .map(
      (p) =>
        `<rect class="cep" data-alt="${r3(p.altitude_m)}" x="${r1(x(p.altitude_m) - 2.5)}" y="${r1(yC(p.cep_m) - 2.5)}" width="5" height="5"/>`,
    )
    .join('');
  const cepPath =
    cepOk.length > 0
      ? `<path class="cepl" d="${cepOk.map((p, i) => `${i ? 'L' : 'M'}${r1(x(p.altitude_m))},${r1(yC(p.cep_m))}`).join(' ')}"/>`
      : '';
  const req =
    opts.requiredPHit !== undefined && Number.isFinite(opts.requiredPHit)
      ? `<line class="req" x1="${padL}" x2="${padL + pw}" y1="${r1(yP(opts.requiredPHit))}" y2="${r1(yP(opts.requiredPHit))}"/>` +
        `<text x="${padL + 4}" y="${r1(yP(opts.requiredPHit) - 3)}" fill="#b42318">required ${esc(opts.requiredPHit)}</text>`
      : '';
  return `${head}${g.join('')}
<rect class="frame" x="${padL}" y="${padT}" width="${pw}" height="${ph}"/>
${req}<path class="phl" d="${line((p) => yP(p.pHit))}"/>${cepPath}${phDots}${cepDots}
<text x="${padL + pw / 2}" y="${H - 4}" text-anchor="middle">release altitude, m above plan ground (hollow: not reachable)</text>
<text transform="translate(11,${r1(padT + ph / 2)}) rotate(-90)" text-anchor="middle" fill="#0f766e">P(hit)</text>
<text transform="translate(${W - 6},${r1(padT + ph / 2)}) rotate(-90)" text-anchor="middle" fill="#b45309">CEP, m</text>
</svg>`;
}
