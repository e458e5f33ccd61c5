/// <reference lib="webworker" />
// Runs altitude sweeps and forecast timelines (many small plans) off the main thread.
import type { Plan } from '../plan';
import { altitudeSweep, planTimeline, type SweepPoint, type TimelineEntry } from '../planner';

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
      post({ id, timeline: planTimeline(req.plan, { step_s: req.step_s }) });
    }
  } catch (e) {
    post({ id, error: e instanceof Error ? e.message : String(e) });
  }
};
