// What the parts of <sf-wind-sources> reach on their host: the plan store and one problem list.
import type { ReactiveControllerHost } from 'lit';
import type { PlanStore } from './plan-store';

/** The <sf-wind-sources> element as its parts see it. */
export interface WindSourcesHost extends ReactiveControllerHost {
  readonly store?: PlanStore;
  /** The problems of the last import, decode or computation, listed under the panel. */
  problems: string[];
}
