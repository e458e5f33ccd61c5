// The crew checklist of <sf-safety-panel>: the crew's own items with state, who, when and a note.
import { css, html } from 'lit';
import type { ChecklistItem } from '../plan';
import { checklistOf, DEFAULT_MANUAL_ITEMS } from '../safety';
import type { PlanStore } from './plan-store';

/** Styles of the checklist items. */
export const crewChecklistStyles = css`
  .item {
    display: grid;
    grid-template-columns: 6.5em 1fr;
    gap: 4px 8px;
    padding: 6px 0;
    border-bottom: 1px solid var(--sf-line);
  }
  .item .meta {
    grid-column: 2;
    display: flex;
    gap: 6px;
    flex-wrap: wrap;
  }
  .item input.text {
    width: 100%;
  }
  .item .meta input {
    width: 9em;
  }
`;

/**
 * The crew items as stored (entries of any kind, so an edit keeps the others as they were), or
 * the plan's template when the plan has none.
 */
function checklistRaw(s: PlanStore): unknown[] {
  if (Array.isArray(s.get('safety.checklist'))) return s.list('safety.checklist');
  return s.plan ? checklistOf(s.plan) : DEFAULT_MANUAL_ITEMS.map((m) => ({ ...m }));
}

/** The crew items to show: an entry that is not an item shows as an empty one. */
function checklist(s: PlanStore): Partial<ChecklistItem>[] {
  return checklistRaw(s).map((m) =>
    m !== null && typeof m === 'object' && !Array.isArray(m) ? (m as Partial<ChecklistItem>) : {},
  );
}

function setChecklist(s: PlanStore, items: unknown[]): void {
  s.edit('safety.checklist', items);
}

function setItem(s: PlanStore, i: number, patch: Partial<ChecklistItem>): void {
  const view = checklist(s);
  const items = checklistRaw(s).map((m, j) => (j === i ? { ...view[j], ...patch } : m));
  setChecklist(s, items);
}

/** Sets an item's state; who defaults to the name typed for the sign-off (`signer`). */
function setState(s: PlanStore, i: number, state: ChecklistItem['state'], signer: string): void {
  const cur = checklist(s)[i] ?? {};
  const who = (typeof cur.who === 'string' && cur.who) || signer || undefined;
  setItem(s, i, {
    state,
    who,
    when: state === 'open' ? undefined : new Date().toISOString().slice(0, 16),
  });
}

function addItem(s: PlanStore): void {
  const items = checklist(s);
  let n = items.length + 1;
  while (items.some((m) => m.id === `item-${n}`)) n++;
  setChecklist(s, [...checklistRaw(s), { id: `item-${n}`, text: 'New item', state: 'open' }]);
}

/** The items and the buttons that add one or reset to the template. */
export function crewChecklist(s: PlanStore, signer: () => string) {
  return html`${checklist(s).map(
      (m, i) =>
        html`<div class="item" data-item=${String(m.id ?? '')}>
          <select
            aria-label=${`State of: ${m.text}`}
            @change=${(e: Event) => setState(s, i, (e.target as HTMLSelectElement).value as ChecklistItem['state'], signer())}
          >
            ${(['open', 'done', 'n/a'] as const).map((st) => html`<option value=${st} ?selected=${m.state === st}>${st}</option>`)}
          </select>
          <input
            class="text"
            aria-label=${`Checklist item ${i + 1}`}
            .value=${String(m.text ?? '')}
            @change=${(e: Event) => setItem(s, i, { text: (e.target as HTMLInputElement).value || String(m.text ?? '') })}
          />
          <div class="meta">
            <input
              aria-label=${`Who, item ${i + 1}`}
              placeholder="who"
              .value=${String(m.who ?? '')}
              @change=${(e: Event) => setItem(s, i, { who: (e.target as HTMLInputElement).value || undefined })}
            />
            <span class="muted">${String(m.when ?? '')}</span>
            <input
              aria-label=${`Note, item ${i + 1}`}
              placeholder="note"
              .value=${String(m.note ?? '')}
              @change=${(e: Event) => setItem(s, i, { note: (e.target as HTMLInputElement).value || undefined })}
            />
            <button
              aria-label=${`Delete item ${i + 1}`}
              title="Delete this item"
              @click=${() =>
                setChecklist(
                  s,
                  checklistRaw(s).filter((_, j) => j !== i),
                )}
            >
              ✕
            </button>
          </div>
        </div>`,
    )}
    <div class="row">
      <button @click=${() => addItem(s)}>Add item</button>
      <button
        @click=${() =>
          setChecklist(
            s,
            DEFAULT_MANUAL_ITEMS.map((m) => ({ ...m })),
          )}
      >
        Reset to template
      </button>
    </div>`;
}
