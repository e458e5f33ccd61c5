/**
 * The release-time timeline as an SVG string: for each site, the clock times over the forecast
 * span at which its chosen variant meets the required P(hit), with P(hit) shaded along the row.
 * The time axis reads in the plan's time zone, with UTC on a second row.
 */
import { esc } from './brief-svg';
import { isUtc, type PlanZone, UTC_ZONE, zoneClock, zoneClockText } from './plan-clock';
import { pHitText, type TimelineEntry } from '../planner';

const MIN = 60_000;
// Tick spacings tried in turn, minutes of the zone's clock; the first whose labels do not touch.
const TICK_STEPS_MIN = [5, 10, 15, 30, 60, 120, 180, 360, 720, 1440];
// Width of text in DejaVu Sans (what the brief prints with): digits and capitals are at most
// about 0.65 em wide (measured on the font's advance widths; common practice to over-estimate).
const textWidth = (s: string, font_px: number): number => s.length * font_px * 0.65;
const AXIS_FONT_PX = 10;
const UTC_FONT_PX = 9;
const ID_FONT_PX = 10;
// Ids are cut to this many characters in the left column; the full id is in each cell's title.
const ID_CHARS = 14;

/** Distinct site ids in order of first appearance. */
export function timelineSiteIds(timeline: readonly TimelineEntry[]): string[] {
  const seen = new Set<string>();
  for (const e of timeline) for (const s of e.sites) seen.add(s.id);
  return [...seen];
}

const shortId = (id: string): string =>
  id.length > ID_CHARS ? `${id.slice(0, ID_CHARS - 1)}…` : id;

/** P(hit) per site and time; `zone`: the plan's time zone for the axis (default UTC). Sizes in px. */
export function timelineSvg(
  timeline: readonly TimelineEntry[],
  requiredPHit: number,
  opts: { width_px?: number; rowHeight_px?: number; zone?: PlanZone } = {},
): string {
  const W = opts.width_px ?? 560;
  const rowH = opts.rowHeight_px ?? 18;
  const zone = opts.zone ?? UTC_ZONE;
  const twoRows = !isUtc(zone);
  const ids = timelineSiteIds(timeline);
  if (timeline.length < 2 || ids.length === 0) {
    return `<svg class="timeline" xmlns="http://www.w3.org/2000/svg" viewBox="0 0 ${W} 40" width="${W}" height="40"><text x="6" y="24">Need at least two forecast times.</text></svg>`;
  }
  // Left column: the site ids and the names of the two axis rows.
  const labelHalf = textWidth('00:00', AXIS_FONT_PX) / 2;
  const rowNamesEnd = 4 + textWidth(twoRows ? zone.label : 'UTC', UTC_FONT_PX);
  // The first tick's label, centred on the left edge of the plot, clears the row names.
  const left = Math.ceil(
    Math.max(
      4 + Math.max(...ids.map((id) => textWidth(shortId(id), ID_FONT_PX))) + 6,
      rowNamesEnd + 6 + labelHalf,
    ),
  );
  // Room on the right for half the last label, so it is never cut off at the edge.
  const right = Math.ceil(labelHalf) + 4;
  const top = 8;
  const rowsBottom = top + ids.length * rowH;
  const yLocal = rowsBottom + 14;
  const yUtc = yLocal + (twoRows ? 12 : 0);
  const H = yUtc + 18;
  const t0 = Date.parse(timeline[0].time);
  const t1 = Date.parse(timeline[timeline.length - 1].time);
  const plotW = W - left - right;
  const x = (t: number): number => left + ((t - t0) / (t1 - t0)) * plotW;
  const cells: string[] = [];
  ids.forEach((id, row) => {
    const y = top + row * rowH;
    cells.push(`<text class="id" x="4" y="${y + rowH - 5}">${esc(shortId(id))}</text>`);
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
        `<rect class="${ok ? 'ok' : 'no'}" data-site="${esc(id)}" x="${xa.toFixed(1)}" y="${y + 2}" width="${Math.max(0.5, xb - xa).toFixed(1)}" height="${rowH - 4}" fill-opacity="${(0.25 + 0.75 * s.pHit).toFixed(2)}"><title>${esc(id)} ${esc(zoneClockText(a, zone))}: P(hit) ${esc(pHitText(s.pHit, s.pHitSE))} (${esc(s.variant)})</title></rect>`,
      );
    }
  });
  // Ticks at round clock times of the plan's zone (a +05:30 zone ticks at its own whole hours).
  const off = zone.offset_min * MIN;
  const minGap = 2 * labelHalf + 8;
  const stepMin =
    TICK_STEPS_MIN.find((m) => ((m * MIN) / (t1 - t0)) * plotW >= minGap) ?? TICK_STEPS_MIN.at(-1)!;
  const step = stepMin * MIN;
  const ticks: string[] = [];
  for (let t = Math.ceil((t0 + off) / step) * step - off; t <= t1; t += step) {
    const xt = x(t);
    ticks.push(
      `<line x1="${xt.toFixed(1)}" x2="${xt.toFixed(1)}" y1="${top}" y2="${rowsBottom + 3}" class="tick"/>`,
    );
    // A label that would reach past either edge of the drawing is left out, never cut.
    if (xt - labelHalf < rowNamesEnd + 4 || xt + labelHalf > W - 1) continue;
    ticks.push(
      `<text class="t-local" x="${xt.toFixed(1)}" y="${yLocal}" text-anchor="middle">${zoneClock(t, zone).time}</text>`,
    );
    if (twoRows) {
      ticks.push(
        `<text class="t-utc" x="${xt.toFixed(1)}" y="${yUtc}" text-anchor="middle">${zoneClock(t, UTC_ZONE).time}</text>`,
      );
    }
  }
  const d0 = zoneClock(t0, zone).date;
  const d1 = zoneClock(t1, zone).date;
  const rowLabels = twoRows
    ? `<text class="zone" x="4" y="${yLocal}">${esc(zone.label)}</text><text class="zone t-utc" x="4" y="${yUtc}">UTC</text>`
    : `<text class="zone" x="4" y="${yLocal}">UTC</text>`;
  const req = Number(requiredPHit.toFixed(3));
  return `<svg class="timeline" xmlns="http://www.w3.org/2000/svg" viewBox="0 0 ${W} ${H}" width="${W}" height="${H}" role="img" aria-label="Release-time timeline, times in ${esc(zone.label)}${twoRows ? ' and UTC' : ''}">
<style>.timeline{font:${AXIS_FONT_PX}px 'DejaVu Sans',system-ui,sans-serif;background:#fff}.timeline .ok{fill:#1a7f37}.timeline .no{fill:#d0d5d3}.timeline .tick{stroke:#e3e7e5}.timeline .id{font-weight:700}.timeline .t-utc{font-size:${UTC_FONT_PX}px;fill:#5b6b66}.timeline .zone{font-size:${UTC_FONT_PX}px;font-weight:700}</style>
${ticks.join('')}${cells.join('')}${rowLabels}
<text x="${left}" y="${H - 3}">${esc(d0 === d1 ? d0 : `${d0} to ${d1}`)} (${esc(zone.label)}) · green: P(hit) ≥ ${req} (darker = higher)</text>
</svg>`;
}
