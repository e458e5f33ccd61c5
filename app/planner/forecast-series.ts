/**
 * Wind forecasts at several valid times: the wind at any clock time by linear interpolation in
 * time of east/north components, and P(hit) per site over the forecast span (a timeline) from
 * which the clock-time release windows meeting requiredPHit are read.
 */
import type { Plan } from '../plan';
import {
  type ElevationModel,
  windFromComponents,
  type WindLayer,
  WindProfile,
  type WindProfileOptions,
} from '../model';
import { planDrop } from './planner';

export interface TimedProfile {
  /** Valid time, ISO 8601 with zone. */
  time: string;
  layers: WindLayer[];
}

/**
 * Profiles with valid times. All share one altitude reference (that of the plan they feed); pass
 * the plan's winds options so altitudes between or below a profile's layers read as the planner
 * reads them. Profiles with an unreadable time are dropped and reported in `problems`.
 */
export class ForecastSeries {
  /** Valid times, ms since the epoch, ascending. */
  readonly times: number[];
  readonly profiles: TimedProfile[];
  readonly problems: string[] = [];
  private readonly winds: WindProfile[];
  private readonly altitudes: number[];
  private readonly offset: number;

  constructor(profiles: readonly TimedProfile[], opts: WindProfileOptions = {}) {
    const ok: { t: number; p: TimedProfile }[] = [];
    (Array.isArray(profiles) ? profiles : []).forEach((p, i) => {
      const t = Date.parse(p?.time);
      if (!Number.isFinite(t)) {
        this.problems.push(`profiles[${i}].time "${p?.time}" is not an ISO 8601 time`);
      } else if (ok.some((o) => o.t === t)) {
        this.problems.push(
          `profiles[${i}].time ${p.time} repeats an earlier profile; kept the first`,
        );
      } else {
        ok.push({ t, p: { time: p.time, layers: Array.isArray(p.layers) ? p.layers : [] } });
      }
    });
    ok.sort((a, b) => a.t - b.t);
    this.times = ok.map((o) => o.t);
    this.profiles = ok.map((o) => o.p);
    this.winds = this.profiles.map((p) => new WindProfile(p.layers, opts));
    this.offset = (opts.reference ?? 'AGL') === 'AGL' ? (opts.groundElevation_m ?? 0) : 0;
    const zs = new Set<number>();
    for (const p of this.profiles) for (const l of p.layers) zs.add(l.altitude_m);
    this.altitudes = [...zs].sort((a, b) => a - b);
  }

  /** First and last valid time, ms since the epoch (NaN when empty). */
  get span(): { start_ms: number; end_ms: number } {
    const n = this.times.length;
    return n === 0
      ? { start_ms: NaN, end_ms: NaN }
      : { start_ms: this.times[0], end_ms: this.times[n - 1] };
  }

  /**
   * Wind layers at `time` (ISO string, Date or ms). At a valid time (and before the first or after
   * the last: clamped) that profile's own layers, unchanged; between two valid times, at every
   * altitude of any profile, the components interpolated linearly in time between the two profiles
   * as each reads at that altitude. Empty series or unreadable time → [].
   */
  profileAt(time: string | Date | number): WindLayer[] {
    const t =
      typeof time === 'number' ? time : time instanceof Date ? time.getTime() : Date.parse(time);
    const n = this.times.length;
    if (n === 0 || !Number.isFinite(t)) return [];
    const copy = (i: number) => this.profiles[i].layers.map((l) => ({ ...l }));
    if (t <= this.times[0]) return copy(0);
    if (t >= this.times[n - 1]) return copy(n - 1);
    let i = 0;
    while (this.times[i + 1] <= t) i++;
    if (this.times[i] === t) return copy(i);
    const w = (t - this.times[i]) / (this.times[i + 1] - this.times[i]);
    const a = this.winds[i];
    const b = this.winds[i + 1];
    return this.altitudes.map((z) => {
      const va = a.at(z + this.offset);
      const vb = b.at(z + this.offset);
      const v = windFromComponents({
        east_mps: va.east_mps + w * (vb.east_mps - va.east_mps),
        north_mps: va.north_mps + w * (vb.north_mps - va.north_mps),
      });
      return { altitude_m: z, fromDeg: v.fromDeg, speed_mps: v.speed_mps };
    });
  }
}

export interface TimelineOptions {
  /** Time between evaluations, s (e.g. 900 for every 15 min). */
  step_s: number;
  /** Monte Carlo samples per evaluation (default min(plan samples, 200)): fewer for speed. */
  samples?: number;
  /** Samples of each window/zone probe inside planDrop (default min(samples, 64)). */
  probeSamples?: number;
  /** Span to cover, ISO times (default: the series span). */
  start?: string;
  end?: string;
  /** Upper bound on the number of evaluations (default 500). */
  maxSteps?: number;
  /** The elevation model the plan is flown over (as planDrop's `terrain`). */
  terrain?: ElevationModel;
}

export interface TimelineEntry {
  /** Clock time, ISO 8601 UTC. */
  time: string;
  sites: {
    id: string;
    /** P(hit) of the chosen variant (pinned, else recommended) at this time, and its standard error. */
    pHit: number;
    pHitSE: number;
    variant: string;
    meetsRequired: boolean;
    byVariant: { variant: string; pHit: number; pHitSE: number }[];
  }[];
}

/**
 * P(hit) of every site over the forecast span at step_s: planDrop with the winds interpolated to
 * each time and the plan's time set to it (so declination follows). The series must share the
 * plan's winds reference. Cost: one planDrop per step.
 */
export function pHitTimeline(
  plan: Plan,
  series: ForecastSeries,
  opts: TimelineOptions,
): TimelineEntry[] {
  const span = series.span;
  const start = opts.start !== undefined ? Date.parse(opts.start) : span.start_ms;
  const end = opts.end !== undefined ? Date.parse(opts.end) : span.end_ms;
  if (!Number.isFinite(start) || !Number.isFinite(end) || end < start) return [];
  const step_ms = Number.isFinite(opts.step_s) && opts.step_s > 0 ? opts.step_s * 1000 : Infinity;
  const maxSteps = opts.maxSteps ?? 500;
  const samples = Math.max(1, opts.samples ?? Math.min(plan.monteCarlo.samples, 200));
  const probeSamples = Math.max(1, opts.probeSamples ?? Math.min(samples, 64));
  const out: TimelineEntry[] = [];
  for (let k = 0; k < maxSteps; k++) {
    const t = start + k * step_ms;
    if (!(t <= end)) break;
    const time = new Date(t).toISOString();
    const result = planDrop(
      {
        ...plan,
        time,
        winds: { ...plan.winds, layers: series.profileAt(t) },
        monteCarlo: { ...plan.monteCarlo, samples },
      },
      { probeSamples, terrain: opts.terrain },
    );
    out.push({
      time,
      sites: result.sites.map((s) => ({
        id: s.id,
        pHit: s.pHit,
        pHitSE: s.pHitSE,
        variant: s.variant,
        meetsRequired: s.meetsRequired,
        byVariant: s.byVariant.map((v) => ({
          variant: v.variant,
          pHit: v.pHit,
          pHitSE: v.pHitSE,
        })),
      })),
    });
  }
  return out;
}

export interface ClockWindow {
  /** First and last evaluated time meeting the requirement, ISO (resolution: the timeline step). */
  open: string;
  close: string;
  /** Chosen variants over the window, in order of first appearance. */
  variants: string[];
}

/**
 * Per site, the runs of consecutive timeline entries whose P(hit) ≥ requiredPHit: of the chosen
 * variant, or of `opts.variant` when given (entries without that variant do not meet it).
 */
export function windowsFromTimeline(
  timeline: readonly TimelineEntry[],
  requiredPHit: number,
  opts: { variant?: string } = {},
): { id: string; windows: ClockWindow[] }[] {
  const ids: string[] = [];
  for (const e of timeline) for (const s of e.sites) if (!ids.includes(s.id)) ids.push(s.id);
  return ids.map((id) => {
    const windows: ClockWindow[] = [];
    let open: ClockWindow | null = null;
    for (const e of timeline) {
      const s = e.sites.find((x) => x.id === id);
      const v = opts.variant ?? s?.variant;
      const p = !s
        ? -1
        : opts.variant === undefined
          ? s.pHit
          : (s.byVariant.find((b) => b.variant === opts.variant)?.pHit ?? -1);
      if (p >= requiredPHit && v !== undefined) {
        if (!open) {
          open = { open: e.time, close: e.time, variants: [] };
          windows.push(open);
        }
        open.close = e.time;
        if (!open.variants.includes(v)) open.variants.push(v);
      } else {
        open = null;
      }
    }
    return { id, windows };
  });
}
