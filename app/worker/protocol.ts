import type { DemGrid } from '../formats';
import type { Plan } from '../plan';
import type { PlanSafety } from '../safety';
import type { PlanResult } from '../planner';

/** Main thread → worker: plan this (already validated) plan. */
export interface WorkerRequest {
  id: number;
  plan: Plan;
  /**
   * Present when the elevation model changed since the last request: its grid, or null for
   * none. The worker keeps it and flies every later plan over it.
   */
  terrain?: DemGrid | null;
}

/** Worker → main thread. */
export type WorkerReply =
  | { id: number; type: 'progress'; done: number; total: number }
  | {
      id: number;
      type: 'result';
      result: PlanResult;
      /** Safety checks of the result; null with safetyError when they could not be computed. */
      safety: PlanSafety | null;
      safetyError?: string;
      elapsed_ms: number;
    }
  | { id: number; type: 'error'; message: string };
