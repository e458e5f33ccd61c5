/**
 * A plan's own release-time timeline: its winds at the plan time plus its stored forecasts
 * (`winds.forecasts`), each read in the plan's altitude reference. The app's worker, the CLI and
 * the brief all call planTimeline, so the same plan gives the same timeline everywhere.
 */
import type { ElevationModel } from '../model';
import { type Plan, planWindOptions } from '../plan';
import {
  ForecastSeries,
  pHitTimeline,
  type TimelineEntry,
  type TimelineOptions,
} from './forecast-series';

/** The app's timeline step, s (every 15 min); also the CLI's default and the brief's. */
export const TIMELINE_STEP_S = 900;
/** Most evaluations in one timeline (each is one planDrop of every site). */
export const TIMELINE_MAX_STEPS = 500;

/** Monte Carlo samples per evaluation: `samples` when given, else min(plan samples, 200). */
export const timelineSamples = (plan: Plan, samples?: number): number =>
  samples ?? Math.min(plan.monteCarlo.samples, 200);

/** The plan's winds at plan.time and its forecasts as one series, altitudes in the plan's reference. */
export function planForecastSeries(plan: Plan): ForecastSeries {
  const w = plan.winds;
  const shift = (ref: 'AGL' | 'MSL' | undefined): number =>
    (ref ?? w.reference) === w.reference
      ? 0
      : ref === 'AGL'
        ? plan.groundElevation_m
        : -plan.groundElevation_m;
  const forecasts = (w.forecasts ?? []).map((f) => ({
    time: f.time,
    layers: f.layers.map((l) => ({ ...l, altitude_m: l.altitude_m + shift(f.reference) })),
  }));
  return new ForecastSeries(
    [{ time: plan.time, layers: w.layers }, ...forecasts],
    planWindOptions(plan),
  );
}

/**
 * Most Monte Carlo descents the brief spends on a timeline it was not asked for (the CLI brief
 * draws one whenever the plan has forecasts): a few seconds of one core. Larger plans get a note
 * pointing to `npm run timeline` instead.
 */
export const BRIEF_TIMELINE_MAX_FLIGHTS = 3_000_000;

/** Descents a timeline of the plan at step_s flies: times × sites × variants × samples. */
export function timelineFlights(plan: Plan, step_s: number, samples?: number): number {
  const span = planForecastSeries(plan).span;
  const times = Number.isFinite(span.end_ms - span.start_ms)
    ? Math.min(TIMELINE_MAX_STEPS, Math.floor((span.end_ms - span.start_ms) / (step_s * 1000)) + 1)
    : 0;
  return times * plan.sites.length * plan.variants.length * timelineSamples(plan, samples);
}

/** pHitTimeline over the plan's own forecast series, at most TIMELINE_MAX_STEPS times. */
export function planTimeline(
  plan: Plan,
  opts: { step_s: number; samples?: number; terrain?: ElevationModel },
): TimelineEntry[] {
  const o: TimelineOptions = {
    terrain: opts.terrain,
    step_s: opts.step_s,
    samples: timelineSamples(plan, opts.samples),
    maxSteps: TIMELINE_MAX_STEPS,
  };
  return pHitTimeline(plan, planForecastSeries(plan), o);
}
