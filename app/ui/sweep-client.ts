// The one sweep worker behind <sf-wind-sources>' altitude sweep and forecast timeline.
import type { ReactiveController } from 'lit';
import type { Dem } from '../formats';
import type { SweepReply, SweepRequest } from '../worker';
import type { WindSourcesHost } from './wind-sources-host';
import { errorText } from './safe-storage';

/** Runs sweep requests in a worker started on first use and ended when the host leaves the page. */
export class SweepClient implements ReactiveController {
  /** A request is running (its buttons are disabled). */
  sweeping = false;
  /** Why the last sweep or timeline could not run (shown beside its button). */
  error = '';
  private worker?: Worker;
  private lastId = 0;
  /** The elevation model the worker holds (it keeps the last one sent); undefined: none sent yet. */
  private sentDem: Dem | null | undefined;

  constructor(private readonly host: WindSourcesHost) {
    host.addController(this);
  }

  hostDisconnected(): void {
    this.worker?.terminate();
    this.worker = undefined;
    this.sentDem = undefined;
  }

  /** Sends one request to the sweep worker; only the latest request's answer is kept. */
  ask(req: SweepRequest, done: (reply: SweepReply) => void): void {
    // A worker that cannot start or stops says so, and the next request starts a new one.
    const failed = (why: string): void => {
      this.worker?.terminate();
      this.worker = undefined;
      this.sentDem = undefined;
      this.sweeping = false;
      this.error = `The computation could not run: ${why}. Try again, or reload the page.`;
      this.host.requestUpdate();
    };
    try {
      this.worker ??= new Worker(new URL('../worker/sweep-worker.ts', import.meta.url), {
        type: 'module',
      });
    } catch (e) {
      failed(`its worker could not start (${errorText(e)})`);
      return;
    }
    const id = ++this.lastId;
    this.sweeping = true;
    this.error = '';
    this.host.requestUpdate();
    this.worker.onmessage = (ev: MessageEvent<SweepReply>) => {
      if (ev.data.id !== this.lastId) return;
      this.sweeping = false;
      if ('error' in ev.data) this.host.problems = [ev.data.error];
      else done(ev.data);
      this.host.requestUpdate();
    };
    this.worker.onerror = (ev: ErrorEvent) => {
      ev.preventDefault();
      failed(ev.message || 'its worker could not start (its script did not load)');
    };
    this.worker.onmessageerror = () => failed('its answer could not be read');
    // The grid (up to 64 MB) is copied to the worker once per model, not with every request.
    const dem = this.host.store?.dem ?? null;
    const terrain = dem === this.sentDem ? undefined : (dem?.grid ?? null);
    this.sentDem = dem;
    this.worker.postMessage({ ...req, id, terrain });
  }
}
