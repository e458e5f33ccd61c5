/**
 * The nominal descent seen from the side, as an SVG string (no DOM): altitude MSL against the
 * horizontal distance from the release, the ground under it filled (gaps where the elevation model
 * has no height), the landing and the site marked. Axes in the display length unit. Everything
 * from outside goes through esc().
 */
import { esc, niceStep } from './brief-svg';
import type { FallProfilePoint } from '../planner';
import type { LabelUnit } from './scatter-svg';

export interface GroundProfileOptions {
  /** Caption (e.g. site and variant ids). */
  title?: string;
  unit?: LabelUnit;
  width_px?: number;
  height_px?: number;
  /** The site: its distance from the release along the path, m, and its elevation MSL, m. */
  site?: { dist_m: number; elevation_m: number };
}

/** Most profile points drawn; more are thinned evenly (the planner gives at most 121). */
const MAX_POINTS = 400;

const f1 = (v: number): string => (Math.round(v * 10) / 10).toString();
const num = (v: number): string => esc(Number(v.toPrecision(6)));

/** Evenly chosen indices of 0..n-1, at most max, first and last kept. */
function thin(n: number, max: number): number[] {
  if (n <= max) return Array.from({ length: n }, (_, i) => i);
  return Array.from({ length: max }, (_, k) => Math.round((k * (n - 1)) / (max - 1)));
}

/** Altitude MSL against distance from the release, with the ground under the descent. */
export function groundProfileSvg(
  points: FallProfilePoint[],
  opts: GroundProfileOptions = {},
): string {
  const W = Math.min(2000, Math.max(260, opts.width_px ?? 480));
  const H = Math.min(1200, Math.max(160, opts.height_px ?? 220));
  const unit = opts.unit ?? { label: 'm', perMetre: 1 };
  const k = Number.isFinite(unit.perMetre) && unit.perMetre > 0 ? unit.perMetre : 1;
  const u = esc(unit.label);
  const caption = opts.title ? esc(opts.title) : 'Descent';
  const all = Array.isArray(points) ? points : [];
  const good = all.filter(
    (p) =>
      p !== null &&
      typeof p === 'object' &&
      Number.isFinite(p.dist_m) &&
      Number.isFinite(p.alt_m) &&
      (p.ground_m === null || Number.isFinite(p.ground_m)),
  );
  const pts = thin(good.length, MAX_POINTS).map((i) => good[i]);
  if (pts.length < 2) {
    return `<svg class="gprof" xmlns="http://www.w3.org/2000/svg" viewBox="0 0 ${W} 40" width="${W}" height="40"><text x="6" y="24">${caption}: no descent to draw.</text></svg>`;
  }
  const site =
    opts.site && Number.isFinite(opts.site.dist_m) && Number.isFinite(opts.site.elevation_m)
      ? opts.site
      : undefined;

  // Extent: every altitude and ground height, the site, and a little air above the release.
  const heights = pts.flatMap((p) => (p.ground_m === null ? [p.alt_m] : [p.alt_m, p.ground_m]));
  if (site) heights.push(site.elevation_m);
  const dists = pts.map((p) => p.dist_m);
  if (site) dists.push(site.dist_m);
  const xMin = Math.min(0, ...dists);
  const xMax = Math.max(xMin + 10, ...dists);
  const lo = Math.min(...heights);
  const hi = Math.max(...heights);
  const span = Math.max(hi - lo, 10);
  const yStep = niceStep(span * 1.1 * k, 4) / k;
  const y0 = Math.floor((lo - 0.05 * span) / yStep) * yStep;
  const y1 = Math.ceil((hi + 0.05 * span) / yStep) * yStep;
  const xStep = niceStep((xMax - xMin) * k, 5) / k;

  const left = 58;
  const right = W - 22;
  const top = 44;
  const bottom = H - 36;
  const X = (d: number): number => left + ((d - xMin) / (xMax - xMin)) * (right - left);
  const Y = (z: number): number => bottom - ((z - y0) / (y1 - y0)) * (bottom - top);

  const out: string[] = [];
  for (let i = Math.ceil(y0 / yStep - 1e-9); i * yStep <= y1 + 1e-9 * yStep; i++) {
    const z = i * yStep;
    out.push(
      `<line class="grid" data-axis="alt" data-v="${num(z * k)}" x1="${left}" x2="${right}" y1="${f1(Y(z))}" y2="${f1(Y(z))}"/>`,
      `<text x="${left - 4}" y="${f1(Y(z) + 3)}" text-anchor="end">${num(z * k)}</text>`,
    );
  }
  for (let i = Math.ceil(xMin / xStep - 1e-9); i * xStep <= xMax + 1e-9 * xStep; i++) {
    const d = i * xStep;
    out.push(
      `<line class="tick" data-axis="dist" data-v="${num(d * k)}" x1="${f1(X(d))}" x2="${f1(X(d))}" y1="${bottom}" y2="${bottom + 4}"/>`,
      `<text x="${f1(X(d))}" y="${bottom + 14}" text-anchor="middle">${num(d * k)}</text>`,
    );
  }

  // Ground: one filled shape per run of known heights, closed down to the axis.
  let run: FallProfilePoint[] = [];
  const flush = (): void => {
    if (run.length >= 2) {
      const line = run.map((p) => `${f1(X(p.dist_m))},${f1(Y(p.ground_m as number))}`);
      const a = f1(X(run[0].dist_m));
      const b = f1(X(run[run.length - 1].dist_m));
      out.push(
        `<polygon class="ground" points="${a},${bottom} ${line.join(' ')} ${b},${bottom}"/>`,
      );
    } else if (run.length === 1) {
      const p = run[0];
      out.push(
        `<line class="ground-pt" x1="${f1(X(p.dist_m))}" x2="${f1(X(p.dist_m))}" y1="${bottom}" y2="${f1(Y(p.ground_m as number))}"/>`,
      );
    }
    run = [];
  };
  for (const p of pts) {
    if (p.ground_m === null) flush();
    else run.push(p);
  }
  flush();
  const gaps = pts.some((p) => p.ground_m === null);

  // Site level (dashed) and position.
  if (site) {
    const sy = f1(Y(site.elevation_m));
    const sx = X(site.dist_m);
    out.push(
      `<line class="site-level" x1="${left}" x2="${right}" y1="${sy}" y2="${sy}"/>`,
      `<path class="site" d="M${f1(sx)},${sy} l-5,-9 h10 z"/>`,
      `<text x="${f1(sx - 8)}" y="${f1(Math.min(bottom - 3, Number(sy) + 12))}" text-anchor="end">site</text>`,
    );
  }

  const path = pts.map((p) => `${f1(X(p.dist_m))},${f1(Y(p.alt_m))}`).join(' ');
  const last = pts[pts.length - 1];
  const lx = X(last.dist_m);
  const ly = Y(last.alt_m);
  out.push(
    `<polyline class="path" points="${path}"/>`,
    `<circle class="landing" cx="${f1(lx)}" cy="${f1(ly)}" r="4"/>`,
    `<text x="${f1(Math.max(left + 40, lx - 7))}" y="${f1(Math.max(top + 8, ly - 7))}" text-anchor="end">landing</text>`,
    `<line class="axis" x1="${left}" x2="${right}" y1="${bottom}" y2="${bottom}"/>`,
    `<line class="axis" x1="${left}" x2="${left}" y1="${top}" y2="${bottom}"/>`,
    `<text x="4" y="${top - 6}">altitude MSL, ${u}</text>`,
    `<text x="${f1((left + right) / 2)}" y="${bottom + 28}" text-anchor="middle">distance from release, ${u}</text>`,
  );
  // Vertical exaggeration: px per metre up over px per metre across.
  const exag = ((bottom - top) / (y1 - y0) / ((right - left) / (xMax - xMin))).toPrecision(2);
  const landing =
    last.ground_m === null
      ? 'ends over no known ground'
      : `meets the ground at ${num(Math.round(last.ground_m * k))} ${u} MSL`;
  return `<svg class="gprof" xmlns="http://www.w3.org/2000/svg" viewBox="0 0 ${W} ${H}" width="${W}" height="${H}" role="img" aria-label="Descent over the ground">
<style>.gprof{font:10px 'DejaVu Sans',system-ui,sans-serif;background:#fff}.gprof .grid{stroke:#e3e7e5}.gprof .axis,.gprof .tick{stroke:#555}.gprof .ground{fill:#d6cbb5;stroke:#7a6a4f;stroke-width:1}.gprof .ground-pt{stroke:#7a6a4f;stroke-width:2}.gprof .path{fill:none;stroke:#0f766e;stroke-width:2}.gprof .landing{fill:#fff;stroke:#0f766e;stroke-width:2}.gprof .site{fill:#be123c}.gprof .site-level{stroke:#be123c;stroke-dasharray:4 3}.gprof .cap{font-weight:bold}</style>
${out.join('')}
<text class="cap" x="4" y="11">${caption}</text>
<text x="4" y="24">${landing}, ${num(Math.round(last.dist_m * k))} ${u} from release; vertical scale ×${esc(exag)}${gaps ? '; gaps: no ground known' : ''}</text>
</svg>`;
}
