/** Talks to the planning worker: sends the valid plan, one request at a time, takes replies. */
import type { Dem } from '../formats';
import type { Plan } from '../plan';
import type { PlanSafety } from '../safety';
import type { PlanResult } from '../planner';
import type { WorkerReply, WorkerRequest } from '../worker';
import { errorText } from './safe-storage';

/** Least time between two progress redraws (ms). */
const PROGRESS_EMIT_MS = 250;

/** The part of the app state a planning run reads (plan) and writes (the rest). */
export interface PlanningState {
  /** The last plan that validated; it is what gets planned. */
  plan: Plan | null;
  result: PlanResult | null;
  resultPlan: Plan | null;
  safety: PlanSafety | null;
  computing: boolean;
  progress: number;
  elapsed_ms: number;
  workerError: string | null;
  /** The elevation model plans are flown over, or null (flat ground). */
  dem: Dem | null;
}

/** One planning worker and the request in flight (a newer plan waits for it to finish). */
export class PlanningRun {
  private worker: Worker | null = null;
  /** The planning worker could not start: no plan is sent (and nothing shows "Planning…"). */
  private workerDead = false;
  private nextId = 1;
  private inFlight = 0;
  private progressShownAt = -Infinity;
  private pending: Plan | null = null;
  private sentPlan: Plan | null = null;
  /** The elevation model the worker holds (it keeps the last one sent). */
  private sentDem: Dem | null = null;
  private computeTimer: ReturnType<typeof setTimeout> | undefined;

  /** emit: tells the app the state changed. */
  constructor(
    private readonly state: PlanningState,
    private readonly emit: () => void,
  ) {}

  /** Starts the worker made by make(); false (and reported) when it cannot be made. */
  start(make: () => Worker): boolean {
    let w: Worker;
    try {
      w = make();
    } catch (e) {
      this.failed(`the planning worker could not start (${errorText(e)})`);
      return false;
    }
    this.attach(w);
    return true;
  }

  /** Sends plans to this worker from now on. */
  attach(worker: Worker): void {
    this.worker = worker;
    this.workerDead = false;
    this.sentDem = null;
    worker.onmessage = (ev: MessageEvent<WorkerReply>) => this.onReply(ev.data);
    worker.onerror = (ev) => {
      // An error with a message comes from the running worker's code: forget the lost request so
      // the next edit is planned again. One without a message is a script that never loaded.
      if (typeof ev.message === 'string' && ev.message) {
        this.state.workerError = ev.message;
        this.forgetRequest();
        return;
      }
      ev.preventDefault?.();
      worker.terminate?.();
      this.failed(
        'the planning worker could not start (its script did not load). Reload the page to try again; your plan is kept',
      );
    };
    worker.onmessageerror = () => {
      this.state.workerError = 'a planning result could not be read';
      this.forgetRequest();
    };
  }

  /** Plans the current plan after delay_ms (a newer call replaces a waiting one). */
  planSoon(delay_ms: number): void {
    if (this.workerDead) return;
    clearTimeout(this.computeTimer);
    this.state.computing = true;
    this.computeTimer = setTimeout(() => this.send(), delay_ms);
  }

  private forgetRequest(): void {
    this.inFlight = 0;
    this.pending = null;
    this.state.computing = false;
    this.emit();
  }

  private failed(why: string): void {
    this.worker = null;
    this.workerDead = true;
    this.state.workerError = why;
    clearTimeout(this.computeTimer);
    this.forgetRequest();
  }

  private send(): void {
    const plan = this.state.plan;
    if (!this.worker || !plan) return;
    if (this.inFlight) {
      this.pending = plan;
      return;
    }
    this.inFlight = this.nextId++;
    this.state.progress = 0;
    this.sentPlan = plan;
    const req: WorkerRequest = { id: this.inFlight, plan };
    // The grid (up to 64 MB) is copied to the worker once per model, not with every plan.
    if (this.state.dem !== this.sentDem) {
      req.terrain = this.state.dem ? this.state.dem.grid : null;
      this.sentDem = this.state.dem;
    }
    this.worker.postMessage(req);
  }

  private onReply(m: WorkerReply): void {
    if (m.id !== this.inFlight) return;
    const s = this.state;
    if (m.type === 'progress') {
      s.progress = m.done / m.total;
      // The worker reports every site; each change event re-renders the map and the panels, so
      // the bar is redrawn at most every PROGRESS_EMIT_MS (the result itself is always shown).
      const now = performance.now();
      if (now - this.progressShownAt < PROGRESS_EMIT_MS) return;
      this.progressShownAt = now;
      this.emit();
      return;
    }
    this.inFlight = 0;
    if (m.type === 'result') {
      s.result = m.result;
      s.resultPlan = this.sentPlan;
      s.safety = m.safety;
      s.elapsed_ms = m.elapsed_ms;
      s.workerError = m.safetyError ? `safety checks failed: ${m.safetyError}` : null;
    } else {
      s.workerError = m.message;
    }
    if (this.pending) {
      this.pending = null;
      this.send();
    } else {
      s.computing = false;
    }
    this.emit();
  }
}
