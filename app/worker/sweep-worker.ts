/// <reference lib="webworker" />
// Runs altitude sweeps and forecast timelines (many small plans) off the main thread.
import { Dem, type DemGrid } from '../formats';
import type { Plan } from '../plan';
import { altitudeSweep, planTimeline, type SweepPoint, type TimelineEntry } from '../planner';

/**
 * `terrain` is present when the elevation model changed since the last request: its grid, or
 * null for none. The worker keeps it and flies every later sweep and timeline over it.
 */
export type SweepRequest = (
  | {
      id: number;
      kind: 'altitude';
      plan: Plan;
      siteId: string;
      variantId: string;
      altitudesAGL_m: number[];
    }
  | { id: number; kind: 'timeline'; plan: Plan; step_s: number }
) & { terrain?: DemGrid | null };

export type SweepReply =
  | { id: number; points: SweepPoint[] }
  | { id: number; timeline: TimelineEntry[] }
  | { id: number; error: string };

/** The elevation model to fly over (null: flat ground), and why the last grid sent would not rebuild. */
let terrain: Dem | null = null;
let terrainError: string | null = null;

self.onmessage = (ev: MessageEvent<SweepRequest>) => {
  const req = ev.data;
  const id = req.id;
  const post = (m: SweepReply): void =>
    (self as unknown as DedicatedWorkerGlobalScope).postMessage(m);
  try {
    if (req.terrain !== undefined) {
      terrain = null;
      terrainError = null;
      try {
        if (req.terrain) terrain = new Dem(req.terrain);
      } catch (e) {
        terrainError = e instanceof Error ? e.message : String(e);
      }
    }
    // Never flat in place of a model that would not rebuild.
    if (terrainError) throw new Error(terrainError);
    const over = terrain ?? undefined;
    if (req.kind === 'altitude') {
      post({
        id,
        points: altitudeSweep(req.plan, req.siteId, req.variantId, req.altitudesAGL_m, {
          terrain: over,
        }),
      });
    } else {
      post({ id, timeline: planTimeline(req.plan, { step_s: req.step_s, terrain: over }) });
    }
  } catch (e) {
    post({ id, error: e instanceof Error ? e.message : String(e) });
  }
};
