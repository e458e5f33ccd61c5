/// <reference lib="webworker" />
// Runs altitude sweeps and forecast timelines (many small plans) off the main thread.
import { type Plan, planWindOptions } from '../plan';
import {
  altitudeSweep,
  ForecastSeries,
  pHitTimeline,
  type SweepPoint,
  type TimelineEntry,
} from '../planner';

export type SweepRequest =
  | {
      id: number;
      kind: 'altitude';
      plan: Plan;
      siteId: string;
      variantId: string;
      altitudesAGL_m: number[];
    }
  | { id: number; kind: 'timeline'; plan: Plan; step_s: number };

export type SweepReply =
  | { id: number; points: SweepPoint[] }
  | { id: number; timeline: TimelineEntry[] }
  | { id: number; error: string };

self.onmessage = (ev: MessageEvent<SweepRequest>) => {
  const req = ev.data;
  const id = req.id;
  const post = (m: SweepReply): void =>
    (self as unknown as DedicatedWorkerGlobalScope).postMessage(m);
  try {
    if (req.kind === 'altitude') {
      post({ id, points: altitudeSweep(req.plan, req.siteId, req.variantId, req.altitudesAGL_m) });
    } else {
      const w = req.plan.winds;
      // Every profile in the plan's own altitude reference.
      const shift = (ref: 'AGL' | 'MSL' | undefined): number =>
        (ref ?? w.reference) === w.reference
          ? 0
          : ref === 'AGL'
            ? req.plan.groundElevation_m
            : -req.plan.groundElevation_m;
      const forecasts = (w.forecasts ?? []).map((f) => ({
        time: f.time,
        layers: f.layers.map((l) => ({ ...l, altitude_m: l.altitude_m + shift(f.reference) })),
      }));
      const series = new ForecastSeries(
        [{ time: req.plan.time, layers: w.layers }, ...forecasts],
        planWindOptions(req.plan),
      );
      post({ id, timeline: pHitTimeline(req.plan, series, { step_s: req.step_s }) });
    }
  } catch (e) {
    post({ id, error: e instanceof Error ? e.message : String(e) });
  }
};
