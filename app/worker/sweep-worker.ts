/// <reference lib="webworker" />
// Runs altitude sweeps (many small plans) off the main thread, one request at a time.
import type { Plan } from '../core/plan';
import { altitudeSweep, type SweepPoint } from '../core/wind-plots';

export interface SweepRequest {
  id: number;
  plan: Plan;
  siteId: string;
  variantId: string;
  altitudesAGL_m: number[];
}

export type SweepReply = { id: number; points: SweepPoint[] } | { id: number; error: string };

self.onmessage = (ev: MessageEvent<SweepRequest>) => {
  const { id, plan, siteId, variantId, altitudesAGL_m } = ev.data;
  const post = (m: SweepReply): void =>
    (self as unknown as DedicatedWorkerGlobalScope).postMessage(m);
  try {
    post({ id, points: altitudeSweep(plan, siteId, variantId, altitudesAGL_m) });
  } catch (e) {
    post({ id, error: e instanceof Error ? e.message : String(e) });
  }
};
