/// <reference lib="webworker" />
// Runs the planning core off the main thread: one request at a time, answered in order.
import { Dem } from '../formats';
import { planSafety, type PlanSafety } from '../safety';
import { planDrop } from '../planner';
import type { Plan } from '../plan';
import type { WorkerReply, WorkerRequest } from './protocol';

const post = (m: WorkerReply): void =>
  (self as unknown as DedicatedWorkerGlobalScope).postMessage(m);

/** The elevation model plans are flown over: the last one the page sent (null: flat ground). */
let terrain: Dem | null = null;
/** Why the last grid sent could not be rebuilt: every plan fails with it until another comes (never flat instead). */
let terrainError: string | null = null;

self.onmessage = (ev: MessageEvent<WorkerRequest>) => {
  const { id, plan } = ev.data;
  try {
    if (ev.data.terrain !== undefined) {
      terrain = null;
      terrainError = null;
      try {
        if (ev.data.terrain) terrain = new Dem(ev.data.terrain);
      } catch (e) {
        terrainError = e instanceof Error ? e.message : String(e);
      }
    }
    if (terrainError) throw new Error(terrainError);
    const t0 = performance.now();
    const result = planDrop(plan as Plan, {
      terrain: terrain ?? undefined,
      onProgress: (done, total) => post({ id, type: 'progress', done, total }),
    });
    let safety: PlanSafety | null = null;
    let safetyError: string | undefined;
    try {
      safety = planSafety(plan as Plan, result);
    } catch (e) {
      safetyError = e instanceof Error ? e.message : String(e);
    }
    post({ id, type: 'result', result, safety, safetyError, elapsed_ms: performance.now() - t0 });
  } catch (e) {
    post({ id, type: 'error', message: e instanceof Error ? e.message : String(e) });
  }
};
