/**
 * The landing scatter of one site × variant as an SVG string (no DOM): the Monte Carlo landings
 * about the site, the 50 % and 95 % ellipses and the tolerance circle, on one scale both ways,
 * north up, with a metric grid. Everything from outside goes through esc().
 */
import { esc, niceStep } from './brief-svg';
import { evenIndices, type SiteEllipse } from '../planner';

/** What the scatter draws: landings in metres east/north of the site. */
export interface ScatterInput {
  east_m: ArrayLike<number>;
  north_m: ArrayLike<number>;
  tolerance_m: number;
  ellipse50: SiteEllipse;
  ellipse95: SiteEllipse;
}

/** A length unit for the labels: its name and how many of it make a metre. */
export interface LabelUnit {
  label: string;
  perMetre: number;
}

export interface ScatterOptions {
  /** Side of the square drawing, px (default 320). */
  size_px?: number;
  /** Most landings drawn, thinned evenly when there are more (default 2,000). */
  maxPoints?: number;
  /** Caption under the drawing (e.g. site and variant ids). */
  title?: string;
  unit?: LabelUnit;
}

const f1 = (v: number): string => (Math.round(v * 10) / 10).toString();

/** Half the width and height of an ellipse's bounding box, m. */
function ellipseHalfBox(e: SiteEllipse): { x: number; y: number } {
  const t = (e.azimuth_deg * Math.PI) / 180;
  // Major axis along (sin t, cos t) (east, north); minor axis across it.
  const [a, b] = [e.semiMajor_m, e.semiMinor_m];
  return {
    x: Math.hypot(a * Math.sin(t), b * Math.cos(t)),
    y: Math.hypot(a * Math.cos(t), b * Math.sin(t)),
  };
}

/** The landing scatter: points, 50/95 % ellipses, tolerance circle and a grid in `unit`. */
export function scatterSvg(s: ScatterInput, opts: ScatterOptions = {}): string {
  const S = Math.max(120, opts.size_px ?? 320);
  const unit = opts.unit ?? { label: 'm', perMetre: 1 };
  const maxPts = Math.max(1, Math.floor(opts.maxPoints ?? 2000));
  const n = Math.min(s.east_m.length, s.north_m.length);
  const idx = n <= maxPts ? Array.from({ length: n }, (_, i) => i) : evenIndices(n, maxPts);
  const pts = idx
    .map((i) => ({ x: s.east_m[i], y: s.north_m[i] }))
    .filter((p) => Number.isFinite(p.x) && Number.isFinite(p.y));
  const tol = Number.isFinite(s.tolerance_m) && s.tolerance_m > 0 ? s.tolerance_m : 0;

  // The frame holds both ellipses, the tolerance circle, the site and the middle 99 % of the
  // landings each way; the few beyond it are drawn on its edge (class "out") and counted.
  let [x0, x1, y0, y1] = [-tol, tol, -tol, tol];
  const grow = (x: number, y: number): void => {
    x0 = Math.min(x0, x);
    x1 = Math.max(x1, x);
    y0 = Math.min(y0, y);
    y1 = Math.max(y1, y);
  };
  if (pts.length > 0) {
    const q = (v: number[], f: number): number => v[Math.round(f * (v.length - 1))];
    const ex = pts.map((p) => p.x).sort((a, b) => a - b);
    const ny = pts.map((p) => p.y).sort((a, b) => a - b);
    grow(q(ex, 0.005), q(ny, 0.005));
    grow(q(ex, 0.995), q(ny, 0.995));
  }
  for (const e of [s.ellipse50, s.ellipse95]) {
    if (![e.east_m, e.north_m, e.semiMajor_m, e.semiMinor_m].every(Number.isFinite)) continue;
    const h = ellipseHalfBox(e);
    grow(e.east_m - h.x, e.north_m - h.y);
    grow(e.east_m + h.x, e.north_m + h.y);
  }
  const span = Math.max(x1 - x0, y1 - y0, 2) * 1.04;
  const [cx, cy] = [(x0 + x1) / 2, (y0 + y1) / 2];
  // Plot square: left margin for the north labels, top for the heading, bottom for the east labels.
  const [L, T] = [46, 22];
  const A = S - L - 8;
  const k = A / span; // px per metre
  const X = (x: number): number => L + A / 2 + (x - cx) * k;
  const Y = (y: number): number => T + A / 2 - (y - cy) * k;
  const half = span / 2;
  const clampX = (x: number): number => Math.min(cx + half, Math.max(cx - half, x));
  const clampY = (y: number): number => Math.min(cy + half, Math.max(cy - half, y));
  const label = (v: number): string => esc(Number(v.toPrecision(6)).toString().replace('-', '−'));

  // Grid in the display unit: a nice step, lines at its multiples, labels at the edges.
  const stepU = niceStep(span * unit.perMetre, 5);
  const step = stepU / unit.perMetre;
  const grid: string[] = [];
  for (let g = Math.ceil((cx - half) / step) * step; g <= cx + half; g += step) {
    const xp = X(g);
    grid.push(
      `<line class="grid" data-axis="east" data-m="${f1(g)}" x1="${f1(xp)}" x2="${f1(xp)}" y1="${T}" y2="${T + A}"/>`,
      `<text x="${f1(xp)}" y="${T + A + 12}" text-anchor="middle">${label(Math.round(g / step) * stepU)}</text>`,
    );
  }
  for (let g = Math.ceil((cy - half) / step) * step; g <= cy + half; g += step) {
    const yp = Y(g);
    grid.push(
      `<line class="grid" data-axis="north" data-m="${f1(g)}" x1="${L}" x2="${L + A}" y1="${f1(yp)}" y2="${f1(yp)}"/>`,
      `<text x="${L - 3}" y="${f1(yp + 3)}" text-anchor="end">${label(Math.round(g / step) * stepU)}</text>`,
    );
  }

  const tol2 = tol * tol;
  let outside = 0;
  const dots = pts.map((p) => {
    const [x, y] = [clampX(p.x), clampY(p.y)];
    const out = x !== p.x || y !== p.y;
    if (out) outside++;
    const cls = out ? 'pt out' : p.x * p.x + p.y * p.y <= tol2 ? 'pt hit' : 'pt';
    return `<circle class="${cls}" cx="${f1(X(x))}" cy="${f1(Y(y))}" r="1.3"/>`;
  });
  const ell = (e: SiteEllipse, cls: string): string =>
    [e.east_m, e.north_m, e.semiMajor_m, e.semiMinor_m, e.azimuth_deg].every(Number.isFinite)
      ? // SVG rotates clockwise on screen; the x axis turned by (azimuth − 90°) points along it.
        `<ellipse class="${cls}" cx="${f1(X(e.east_m))}" cy="${f1(Y(e.north_m))}" rx="${f1(Math.max(0.5, e.semiMajor_m * k))}" ry="${f1(Math.max(0.5, e.semiMinor_m * k))}" transform="rotate(${f1(e.azimuth_deg - 90)} ${f1(X(e.east_m))} ${f1(Y(e.north_m))})"/>`
      : '';
  const u = esc(unit.label);
  const caption = opts.title ? esc(opts.title) : 'Landings';
  const B = T + A + 30; // first caption line
  const H = B + 32;
  return `<svg class="scatter" xmlns="http://www.w3.org/2000/svg" viewBox="0 0 ${S} ${H}" width="${S}" height="${H}" role="img" aria-label="Landing scatter">
<style>.scatter{font:10px 'DejaVu Sans',system-ui,sans-serif;background:#fff}.scatter .grid{stroke:#e3e7e5}.scatter .pt{fill:#8a9490;fill-opacity:.55}.scatter .pt.hit{fill:#0f766e;fill-opacity:.75}.scatter .pt.out{fill:#b42318}.scatter .e50{fill:none;stroke:#b45309;stroke-width:1.5}.scatter .e95{fill:none;stroke:#b45309;stroke-width:1.5;stroke-dasharray:5 3}.scatter .tol{fill:none;stroke:#1d4ed8;stroke-width:2}.scatter .site{stroke:#111;stroke-width:1.5}</style>
<rect x="${L}" y="${T}" width="${A}" height="${A}" fill="none" stroke="#c9d1ce"/>
${grid.join('')}
${dots.join('')}
${ell(s.ellipse50, 'e50')}${ell(s.ellipse95, 'e95')}
${tol > 0 ? `<circle class="tol" data-r-m="${f1(tol)}" cx="${f1(X(0))}" cy="${f1(Y(0))}" r="${f1(tol * k)}"/>` : ''}
<path class="site" d="M${f1(X(0) - 5)} ${f1(Y(0))}h10M${f1(X(0))} ${f1(Y(0) - 5)}v10"/>
<text x="${L + A}" y="${T - 7}" text-anchor="end">N ↑ · grid ${label(stepU)} ${u}</text>
<text x="4" y="${T - 7}">${u} north / east of the site (+)</text>
<text x="4" y="${B}">${caption}: ${pts.length}${pts.length < n ? ` of ${n}` : ''} landings</text>
<text x="4" y="${B + 13}">green: within tolerance${outside > 0 ? `; red: ${outside} beyond, on the edge` : ''}</text>
<text x="4" y="${B + 26}">blue: tolerance ${esc(f1(tol * unit.perMetre))} ${u}; brown: 50 % ellipse, 95 % dashed</text>
</svg>`;
}
