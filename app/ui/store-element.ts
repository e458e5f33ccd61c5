// The base of the elements bound to the plan store: a `store` property and a re-render on change.
import { LitElement } from 'lit';
import { property } from 'lit/decorators.js';
import type { PlanStore } from './plan-store';
import { StoreController } from './store-controller';

/** A Lit element showing part of the plan: re-renders whenever its plan store changes. */
export class StoreElement extends LitElement {
  @property({ attribute: false }) store?: PlanStore;

  constructor() {
    super();
    new StoreController(this, () => this.store);
  }
}
