/**
 * The release-time timeline for the crew: per site, the clock times at which its release window
 * opens and closes (read from the timeline by windowsFromTimeline), in the plan's time zone with
 * UTC beside them; and the brief's section (heading, the timeline drawing, that list).
 */
import { esc } from './brief-svg';
import { planZone, type PlanZone, zoneClock, zoneClockText } from './plan-clock';
import { timelineSiteIds, timelineSvg } from './timeline-svg';
import type { Plan } from '../plan';
import { type ClockWindow, type TimelineEntry, windowsFromTimeline } from '../planner';

/** One window of a site with its clock times as text. */
export interface ClockWindowText extends ClockWindow {
  /** "10:15 UTC+01:00 (09:15 UTC)"; dates in front when the timeline spans more than one day. */
  openText: string;
  closeText: string;
  /** Open already at the first evaluated time / still open at the last (it may reach beyond). */
  atStart: boolean;
  atEnd: boolean;
}

/** The timeline's clock windows per site, in timeline order; a site without one has `windows: []`. */
export interface TimelineWindows {
  zone: PlanZone;
  /** Time between evaluations, s (NaN with fewer than two). */
  step_s: number;
  start: string;
  end: string;
  sites: { id: string; windows: ClockWindowText[] }[];
}

/** Per-site windows of a timeline with clock texts in `zone` (the plan's, see planZone). */
export function timelineWindows(
  timeline: readonly TimelineEntry[],
  requiredPHit: number,
  zone: PlanZone,
): TimelineWindows {
  const first = timeline[0]?.time ?? '';
  const last = timeline.at(-1)?.time ?? '';
  const t0 = Date.parse(first);
  const t1 = Date.parse(last);
  const withDate =
    zoneClock(t0, zone).date !== zoneClock(t1, zone).date ||
    first.slice(0, 10) !== last.slice(0, 10);
  const step_s = timeline.length >= 2 ? (Date.parse(timeline[1].time) - t0) / 1000 : NaN;
  const byId = new Map(windowsFromTimeline(timeline, requiredPHit).map((w) => [w.id, w.windows]));
  return {
    zone,
    step_s,
    start: first,
    end: last,
    sites: timelineSiteIds(timeline).map((id) => ({
      id,
      windows: (byId.get(id) ?? []).map((w) => ({
        ...w,
        openText: zoneClockText(Date.parse(w.open), zone, withDate),
        closeText: zoneClockText(Date.parse(w.close), zone, withDate),
        atStart: w.open === first,
        atEnd: w.close === last,
      })),
    })),
  };
}

/** "15 min", "90 s", "2 h": a step for a sentence. */
export function stepText(step_s: number): string {
  if (!Number.isFinite(step_s)) return '—';
  if (step_s % 3600 === 0) return `${step_s / 3600} h`;
  if (step_s % 60 === 0) return `${step_s / 60} min`;
  return `${step_s} s`;
}

/** What a site with no window is told. */
export const noWindowText = (requiredPHit: number): string =>
  `no evaluated time meets P(hit) ≥ ${Number(requiredPHit.toFixed(3))}`;

/** How to read the window list (the same sentence in the app, the brief and the CLI). */
export function windowsNote(w: TimelineWindows, requiredPHit: number): string {
  return `A window opens at the first evaluated time at which the site's chosen variant meets P(hit) ≥ ${Number(requiredPHit.toFixed(3))} and closes at the last, to the timeline's ${stepText(w.step_s)} step; a window marked "from the first time" or "to the last time" may reach beyond the forecast span. Times in ${w.zone.label}${w.zone.offset_min === 0 ? '' : ' (the plan’s time zone), UTC in brackets'}. Between forecast times the winds are interpolated linearly: check them on the day.`;
}

/**
 * The brief's timeline section: heading, drawing and per-site window list; '' without a timeline.
 * `opts.width_px`: drawing width.
 */
export function timelineSection(
  plan: Plan,
  timeline: readonly TimelineEntry[] | undefined,
  opts: { width_px?: number; omitted?: string } = {},
): string {
  if ((!timeline || timeline.length === 0) && opts.omitted) {
    return `<section class="timeline-section"><h2>Release-time timeline</h2><p>${esc(opts.omitted)}</p></section>`;
  }
  if (!timeline || timeline.length === 0) return '';
  const zone = planZone(plan.time);
  const w = timelineWindows(timeline, plan.requiredPHit, zone);
  const rows = w.sites
    .map((s) => {
      if (s.windows.length === 0) {
        return `<tr data-site="${esc(s.id)}"><td>${esc(s.id)}</td><td colspan="4" class="bad">${esc(noWindowText(plan.requiredPHit))}</td></tr>`;
      }
      return s.windows
        .map(
          (x, i) =>
            `<tr data-site="${esc(s.id)}"><td>${i === 0 ? esc(s.id) : ''}</td><td>${esc(x.openText)}</td><td>${esc(x.closeText)}</td><td>${esc(x.variants.join(', '))}</td><td>${[x.atStart ? 'from the first time' : '', x.atEnd ? 'to the last time' : ''].filter(Boolean).join('; ')}</td></tr>`,
        )
        .join('');
    })
    .join('');
  return `<section class="timeline-section"><h2>Release-time timeline</h2>
<div class="figure">${timelineSvg(timeline, plan.requiredPHit, { zone, width_px: opts.width_px })}
<p class="small">P(hit) of each site’s chosen variant every ${esc(stepText(w.step_s))} from ${esc(zoneClockText(Date.parse(w.start), zone))} to ${esc(zoneClockText(Date.parse(w.end), zone))}, with the forecast winds interpolated to each time.</p></div>
<h3>Release windows by clock time</h3>
<table class="windows"><thead><tr><th>Site</th><th>Opens</th><th>Closes</th><th>Variant</th><th>Note</th></tr></thead>
<tbody>${rows}</tbody></table>
<p class="small">${esc(windowsNote(w, plan.requiredPHit))}</p></section>`;
}
