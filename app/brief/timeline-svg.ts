/**
 * The release-time timeline as an SVG string: for each site, the clock times over the forecast
 * span at which its chosen variant meets the required P(hit), with P(hit) shaded along the row.
 */
import { esc } from './brief-svg';
import { pHitText, type TimelineEntry } from '../planner';

/** Timeline rows per site; times in the plan's local offset are left to the caller's labels. */
export function timelineSvg(
  timeline: readonly TimelineEntry[],
  requiredPHit: number,
  opts: { width_px?: number; rowHeight_px?: number } = {},
): string {
  const W = opts.width_px ?? 560;
  const rowH = opts.rowHeight_px ?? 18;
  const ids: string[] = [];
  for (const e of timeline) for (const s of e.sites) if (!ids.includes(s.id)) ids.push(s.id);
  const left = 44;
  const top = 8;
  const H = top + ids.length * rowH + 34;
  if (timeline.length < 2 || ids.length === 0) {
    return `<svg class="timeline" xmlns="http://www.w3.org/2000/svg" viewBox="0 0 ${W} 40" width="${W}" height="40"><text x="6" y="24">Need at least two forecast times.</text></svg>`;
  }
  const t0 = Date.parse(timeline[0].time);
  const t1 = Date.parse(timeline[timeline.length - 1].time);
  const x = (t: number): number => left + ((t - t0) / (t1 - t0)) * (W - left - 10);
  const cells: string[] = [];
  ids.forEach((id, row) => {
    const y = top + row * rowH;
    cells.push(`<text class="id" x="4" y="${y + rowH - 5}">${esc(id)}</text>`);
    for (let i = 0; i < timeline.length; i++) {
      const e = timeline[i];
      const s = e.sites.find((q) => q.id === id);
      if (!s) continue;
      const a = Date.parse(e.time);
      const b = i + 1 < timeline.length ? Date.parse(timeline[i + 1].time) : a;
      const half = (i > 0 ? a - Date.parse(timeline[i - 1].time) : b - a) / 2;
      const xa = x(Math.max(t0, a - half));
      const xb = x(Math.min(t1, i + 1 < timeline.length ? (a + b) / 2 : a));
      const ok = s.pHit >= requiredPHit;
      cells.push(
        `<rect class="${ok ? 'ok' : 'no'}" data-site="${esc(id)}" x="${xa.toFixed(1)}" y="${y + 2}" width="${Math.max(0.5, xb - xa).toFixed(1)}" height="${rowH - 4}" fill-opacity="${(0.25 + 0.75 * s.pHit).toFixed(2)}"><title>${esc(id)} ${esc(e.time)}: P(hit) ${esc(pHitText(s.pHit, s.pHitSE))} (${esc(s.variant)})</title></rect>`,
      );
    }
  });
  const ticks: string[] = [];
  const span = t1 - t0;
  const stepH = span > 12 * 3600e3 ? 3 : span > 4 * 3600e3 ? 1 : 0.5;
  for (let t = Math.ceil(t0 / (stepH * 3600e3)) * stepH * 3600e3; t <= t1; t += stepH * 3600e3) {
    const xt = x(t);
    ticks.push(
      `<line x1="${xt.toFixed(1)}" x2="${xt.toFixed(1)}" y1="${top}" y2="${H - 26}" class="tick"/>`,
    );
    ticks.push(
      `<text x="${xt.toFixed(1)}" y="${H - 14}" text-anchor="middle">${new Date(t).toISOString().slice(11, 16)}</text>`,
    );
  }
  return `<svg class="timeline" xmlns="http://www.w3.org/2000/svg" viewBox="0 0 ${W} ${H}" width="${W}" height="${H}" role="img" aria-label="Release-time timeline">
<style>.timeline{font:10px 'DejaVu Sans',system-ui,sans-serif;background:#fff}.timeline .ok{fill:#1a7f37}.timeline .no{fill:#d0d5d3}.timeline .tick{stroke:#e3e7e5}.timeline .id{font-weight:700}</style>
${ticks.join('')}${cells.join('')}
<text x="${left}" y="${H - 2}">UTC; green: P(hit) ≥ ${requiredPHit} (darker = higher)</text>
</svg>`;
}
