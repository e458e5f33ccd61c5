// The ✕ button that deletes one entry of a list in the plan.
import { html } from 'lit';
import type { PlanStore } from './plan-store';

/** A ✕ button named `label` that removes entry `i` of the list at `path`. */
export function deleteRowButton(s: PlanStore, path: string, i: number, label: string) {
  const remove = (): void =>
    s.edit(
      path,
      s.list(path).filter((_, j) => j !== i),
    );
  return html`<button aria-label=${label} @click=${remove}>✕</button>`;
}
