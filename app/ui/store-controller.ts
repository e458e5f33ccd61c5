import type { ReactiveController, ReactiveControllerHost } from 'lit';
import type { PlanStore } from './plan-store';

/** Re-renders its host whenever the plan store changes. */
export class StoreController implements ReactiveController {
  private readonly onChange = (): void => this.host.requestUpdate();

  constructor(
    private readonly host: ReactiveControllerHost,
    private readonly store: () => PlanStore | undefined,
  ) {
    host.addController(this);
  }

  hostConnected(): void {
    this.store()?.addEventListener('change', this.onChange);
  }

  hostDisconnected(): void {
    this.store()?.removeEventListener('change', this.onChange);
  }
}
