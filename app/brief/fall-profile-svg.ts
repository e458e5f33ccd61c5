/**
 * The nominal fall of one variant as an SVG string (no DOM): height above the site's ground
 * against time from release (left) and against the wind drift so far (right), with axes in
 * seconds and the display length unit. Everything from outside goes through esc().
 */
import { esc, niceStep } from './brief-svg';
import type { FallProfile } from '../planner';
import type { LabelUnit } from './scatter-svg';

export interface FallProfileOptions {
  width_px?: number;
  height_px?: number;
  /** Caption (e.g. the variant id). */
  title?: string;
  unit?: LabelUnit;
}

const f1 = (v: number): string => (Math.round(v * 10) / 10).toString();
const num = (v: number): string => esc(Number(v.toPrecision(6)));

interface Panel {
  x0: number;
  x1: number;
  xs: number[];
  xLabel: string;
  xUnitPerM: number;
  cls: string;
}

/** Height against time and against drift distance, from the planner's fall table nodes. */
export function fallProfileSvg(p: FallProfile, opts: FallProfileOptions = {}): string {
  const W = Math.max(240, opts.width_px ?? 420);
  const H = Math.max(140, opts.height_px ?? 200);
  const unit = opts.unit ?? { label: 'm', perMetre: 1 };
  const u = esc(unit.label);
  const n = Math.min(
    p.time_s.length,
    p.height_m.length,
    p.driftEast_m.length,
    p.driftNorth_m.length,
  );
  const ok = (i: number): boolean =>
    [p.time_s[i], p.height_m[i], p.driftEast_m[i], p.driftNorth_m[i]].every(Number.isFinite);
  const idx = Array.from({ length: n }, (_, i) => i).filter(ok);
  const caption = opts.title ? esc(opts.title) : 'Fall';
  if (idx.length < 2) {
    return `<svg class="fall" xmlns="http://www.w3.org/2000/svg" viewBox="0 0 ${W} 40" width="${W}" height="40"><text x="6" y="24">${caption}: no fall to draw.</text></svg>`;
  }
  const t = idx.map((i) => p.time_s[i]);
  const h = idx.map((i) => p.height_m[i]);
  const d = idx.map((i) => Math.hypot(p.driftEast_m[i], p.driftNorth_m[i]));
  const hMax = Math.max(...h, 1);
  const top = 32;
  const bottom = H - 38;
  const Y = (z: number): number => bottom - (z / hMax) * (bottom - top);
  const left = 46;
  const gap = 40;
  const pw = (W - left - gap - 10) / 2;
  const panels: Panel[] = [
    {
      x0: 0,
      x1: Math.max(...t, 1),
      xs: t,
      xLabel: 'time from release, s',
      xUnitPerM: 1,
      cls: 'time',
    },
    {
      x0: 0,
      x1: Math.max(...d, 2),
      xs: d,
      xLabel: `wind drift, ${unit.label}`,
      xUnitPerM: unit.perMetre,
      cls: 'drift',
    },
  ];
  const out: string[] = [];
  // Height axis (shared): ticks in the display unit.
  const hStep = niceStep(hMax * unit.perMetre, 4) / unit.perMetre;
  for (let z = 0; z <= hMax + 1e-9; z += hStep) {
    out.push(
      `<line class="grid" x1="${left}" x2="${W - 10}" y1="${f1(Y(z))}" y2="${f1(Y(z))}"/>`,
      `<text x="${left - 4}" y="${f1(Y(z) + 3)}" text-anchor="end">${num(z * unit.perMetre)}</text>`,
    );
  }
  out.push(`<text x="4" y="${top - 5}">height above ground, ${u}</text>`);
  panels.forEach((q, k) => {
    const px0 = left + k * (pw + gap);
    const X = (v: number): number => px0 + ((v - q.x0) / (q.x1 - q.x0)) * pw;
    const step = niceStep((q.x1 - q.x0) * q.xUnitPerM, 4) / q.xUnitPerM;
    for (let v = 0; v <= q.x1 + 1e-9; v += step) {
      out.push(
        `<line class="tick" x1="${f1(X(v))}" x2="${f1(X(v))}" y1="${bottom}" y2="${bottom + 4}"/>`,
        `<text x="${f1(X(v))}" y="${bottom + 14}" text-anchor="middle">${num(v * q.xUnitPerM)}</text>`,
      );
    }
    out.push(
      `<line class="axis" x1="${f1(px0)}" x2="${f1(px0 + pw)}" y1="${bottom}" y2="${bottom}"/>`,
      `<line class="axis" x1="${f1(px0)}" x2="${f1(px0)}" y1="${top}" y2="${bottom}"/>`,
      `<text x="${f1(px0 + pw / 2)}" y="${bottom + 27}" text-anchor="middle">${esc(q.xLabel)}</text>`,
      `<polyline class="line ${q.cls}" points="${q.xs.map((v, i) => `${f1(X(v))},${f1(Y(h[i]))}`).join(' ')}"/>`,
    );
  });
  return `<svg class="fall" xmlns="http://www.w3.org/2000/svg" viewBox="0 0 ${W} ${H}" width="${W}" height="${H}" role="img" aria-label="Fall profile">
<style>.fall{font:10px 'DejaVu Sans',system-ui,sans-serif;background:#fff}.fall .grid{stroke:#e3e7e5}.fall .axis,.fall .tick{stroke:#555}.fall .line{fill:none;stroke:#0f766e;stroke-width:2}</style>
${out.join('')}
<text x="4" y="11">${caption}: fall ${num(Math.round(t[t.length - 1] * 10) / 10)} s, wind drift ${num(Math.round(d[d.length - 1] * unit.perMetre))} ${u}</text>
</svg>`;
}
