// `timeline`: P(hit) per site over the plan's forecast span and each site's release windows by
// clock time, in the plan's time zone with UTC beside it; JSON or a text table.
import {
  CAUTION_TEXT,
  noWindowText,
  planZone,
  stepText,
  timelineWindows,
  zoneClock,
  zoneClockText,
  UTC_ZONE,
} from '../brief';
import type { ElevationModel } from '../model';
import type { Plan } from '../plan';
import {
  planForecastSeries,
  planTimeline,
  TIMELINE_MAX_STEPS,
  TIMELINE_STEP_S,
  timelineSamples,
  type TimelineEntry,
  windowsFromTimeline,
} from '../planner';
import { fail, oneLine, STEP_RANGE_S, terminalText, type Args, type CliIO } from './args';

/** Site columns per block of the text P(hit) table (the table wraps into blocks, never sideways). */
const SITES_PER_BLOCK = 8;

/** Writes the plan's timeline in the format asked for; warnings (from reading the plan) included. */
export function timelineCommand(
  args: Args,
  io: CliIO,
  plan: Plan,
  warnings: string[],
  terrain?: ElevationModel,
): void {
  if ((plan.winds.forecasts ?? []).length === 0) {
    fail(
      'the plan has no wind forecasts (winds.forecasts): the timeline needs at least one forecast valid at another time than the plan time; store one in the app (Winds tab) or add it to the file',
      1,
    );
  }
  const series = planForecastSeries(plan);
  // Profile 0 is the plan's own winds; the others are winds.forecasts in order.
  const problems = series.problems.map((p) =>
    p.replace(/profiles\[(\d+)\]/, (_, i: string) =>
      Number(i) === 0 ? 'the plan time' : `winds.forecasts[${Number(i) - 1}]`,
    ),
  );
  const { start_ms, end_ms } = series.span;
  if (series.times.length < 2) {
    fail(
      `winds.forecasts hold no time other than the plan time ${oneLine(plan.time)}; the timeline needs winds at two different times${problems.length ? ` (${oneLine(problems.join('; '))})` : ''}`,
      1,
    );
  }
  const step_s = args.step_s ?? TIMELINE_STEP_S;
  const steps = Math.floor((end_ms - start_ms) / (step_s * 1000)) + 1;
  if (steps > TIMELINE_MAX_STEPS) {
    // The smallest whole-minute step that fits, within the allowed range.
    const fit_s = Math.ceil((end_ms - start_ms) / 1000 / (TIMELINE_MAX_STEPS - 1) / 60) * 60;
    const span = `${new Date(start_ms).toISOString()} to ${new Date(end_ms).toISOString()}`;
    fail(
      `--step ${stepArg(step_s)}${args.step_s === undefined ? ' (the default)' : ''} gives ${steps} times over the forecast span ${span}; at most ${TIMELINE_MAX_STEPS}: ${fit_s <= STEP_RANGE_S.max ? `use --step ${fit_s / 60}m or more` : 'the span is too long for any step up to 6h; store fewer forecasts'}`,
      1,
    );
  }
  if (steps === 1) {
    problems.push(
      `--step ${stepArg(step_s)} is longer than the forecast span (${stepText((end_ms - start_ms) / 1000)}): only its first time is evaluated`,
    );
  }
  const samples = timelineSamples(plan, args.samples);
  const entries = planTimeline(plan, { step_s, samples: args.samples, terrain });
  const zone = planZone(plan.time);
  const allWarnings = [...warnings, ...problems];
  if (args.format === 'json') {
    const out = {
      timeZone: zone.label,
      step_s,
      samples,
      requiredPHit: plan.requiredPHit,
      entries,
      windows: windowsFromTimeline(entries, plan.requiredPHit),
      warnings: allWarnings,
      caution: CAUTION_TEXT,
    };
    io.out(`${JSON.stringify(out, null, 2)}\n`);
  } else {
    io.out(terminalText(timelineText(plan, entries, step_s, samples, allWarnings)));
  }
}

/** A step as the option is written: 15m, 90s, 1h. */
const stepArg = (s: number): string =>
  s % 3600 === 0 ? `${s / 3600}h` : s % 60 === 0 ? `${s / 60}m` : `${s}s`;

const pad = (s: string, n: number): string => s + ' '.repeat(Math.max(0, n - [...s].length));

/** Rows as aligned columns, two spaces apart; a row's last cell may run on past the columns. */
function columns(rows: string[][]): string[] {
  const widths = rows[0].map((_, c) =>
    Math.max(...rows.map((r) => (c < r.length - 1 ? [...r[c]].length : 0))),
  );
  return rows.map((r) =>
    r
      .map((x, c) => (c === r.length - 1 ? x : pad(x, widths[c])))
      .join('  ')
      .trimEnd(),
  );
}

/** The timeline as text: the window list, then P(hit) per time and site. */
export function timelineText(
  plan: Plan,
  entries: readonly TimelineEntry[],
  step_s: number,
  samples: number,
  warnings: readonly string[],
): string {
  const zone = planZone(plan.time);
  const req = Number(plan.requiredPHit.toFixed(3));
  const w = timelineWindows(entries, plan.requiredPHit, zone);
  const t0 = Date.parse(w.start);
  const t1 = Date.parse(w.end);
  const lines: string[] = [
    `Release-time timeline: ${plan.name}`,
    `Every ${stepText(step_s)} from ${zoneClockText(t0, zone, true)} to ${zoneClockText(t1, zone, true)}; ${samples} samples per time; required P(hit) ${req}.`,
    `Times in ${zone.label}${zone.offset_min === 0 ? '' : " (the plan's time zone), UTC in brackets"}.`,
    '',
    'Release windows (first and last evaluated time at which the chosen variant meets P(hit))',
  ];
  const rows: string[][] = [['site', 'opens', 'closes', 'variant', 'note']];
  for (const s of w.sites) {
    if (s.windows.length === 0) rows.push([s.id, noWindowText(plan.requiredPHit)]);
    s.windows.forEach((x, i) =>
      rows.push([
        i === 0 ? s.id : '',
        x.openText,
        x.closeText,
        x.variants.join(', '),
        [x.atStart ? 'from the first time' : '', x.atEnd ? 'to the last time' : '']
          .filter(Boolean)
          .join('; '),
      ]),
    );
  }
  lines.push(
    ...columns(rows),
    '',
    `P(hit) of the chosen variant by time (* meets ${req}; ± its standard error in the JSON)`,
  );
  const ids = w.sites.map((s) => s.id);
  for (let b = 0; b < ids.length; b += SITES_PER_BLOCK) {
    const block = ids.slice(b, b + SITES_PER_BLOCK);
    const head = zone.offset_min === 0 ? ['UTC'] : [zone.label, 'UTC'];
    const table: string[][] = [[...head, ...block]];
    for (const e of entries) {
      const t = Date.parse(e.time);
      const clock = zone.offset_min === 0 ? [] : [zoneClock(t, zone).time];
      table.push([
        ...clock,
        zoneClock(t, UTC_ZONE).time,
        ...block.map((id) => {
          const s = e.sites.find((x) => x.id === id);
          return s ? `${s.pHit.toFixed(2)}${s.pHit >= plan.requiredPHit ? '*' : ' '}` : '—';
        }),
      ]);
    }
    lines.push('', ...columns(table));
  }
  if (warnings.length) lines.push('', ...warnings.map((x) => `warning: ${x}`));
  lines.push('', `CAUTION: ${CAUTION_TEXT}`, '');
  return lines.join('\n');
}
