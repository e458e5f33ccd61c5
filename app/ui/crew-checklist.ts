// The crew checklist of <sf-safety-panel>: the crew's own items with state, who, when and a note;
// an item is done only with a person's name.
import { css, html, type ReactiveControllerHost } from 'lit';
import type { ChecklistItem } from '../plan';
import { checklistOf, DEFAULT_MANUAL_ITEMS, doneWithoutName } from '../safety';
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
  .item .who-missing {
    flex-basis: 100%;
    font-size: 12px;
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

/**
 * The key a pending tick is kept under: the item's id (or its place when it has none) and its
 * text, so a tick never carries over to another item, or to another plan opened meanwhile.
 */
const keyOf = (m: Partial<ChecklistItem>, i: number): string =>
  JSON.stringify([typeof m.id === 'string' ? m.id : i, String(m.text ?? '')]);

const now = (): string => new Date().toISOString().slice(0, 16);

function addItem(s: PlanStore): void {
  const items = checklist(s);
  let n = items.length + 1;
  while (items.some((m) => m.id === `item-${n}`)) n++;
  setChecklist(s, [...checklistRaw(s), { id: `item-${n}`, text: 'New item', state: 'open' }]);
}

/**
 * The crew items with state, who, when and a note, and the buttons that add one or reset to the
 * template. An item is marked done only with a person's name: the item's own "who", or the name
 * typed for the sign-off. Without one the tick is refused with a message beside "who" and kept
 * pending; typing a name then completes it. An item that is done with nobody named (an older
 * file) is shown as such and counts as open (readiness), never filled in silently.
 */
export class CrewChecklist {
  /** Ticks waiting for a name, by item key. */
  private readonly pending = new Set<string>();

  constructor(private readonly host: ReactiveControllerHost) {}

  private setState(
    s: PlanStore,
    i: number,
    state: ChecklistItem['state'],
    signer: string,
    select: HTMLSelectElement,
  ): void {
    const cur = checklist(s)[i] ?? {};
    const key = keyOf(cur, i);
    const who = (typeof cur.who === 'string' && cur.who.trim()) || signer.trim() || undefined;
    if (state === 'done' && !who) {
      // Refused: the stored state stays, the select shows it again, the tick waits for a name.
      this.pending.add(key);
      select.value = String(cur.state ?? 'open');
      this.host.requestUpdate();
      return;
    }
    this.pending.delete(key);
    setItem(s, i, { state, who, when: state === 'open' ? undefined : now() });
  }

  private setWho(s: PlanStore, i: number, text: string): void {
    const cur = checklist(s)[i] ?? {};
    const key = keyOf(cur, i);
    const who = text.trim() ? text : undefined;
    if (who && this.pending.has(key)) {
      this.pending.delete(key);
      setItem(s, i, { who, state: 'done', when: now() });
      return;
    }
    setItem(s, i, { who });
  }

  private reset(): void {
    this.pending.clear();
    this.host.requestUpdate();
  }

  /** Why the item cannot count as done yet, beside its "who" field; '' when nothing is missing. */
  private missing(m: Partial<ChecklistItem>, i: number): string {
    if (this.pending.has(keyOf(m, i)) && m.state !== 'done') {
      return 'Not marked done: enter who checked this item (or your name under Sign-off).';
    }
    if (doneWithoutName(m)) {
      return 'Marked done but nobody is named: enter who checked it. It counts as open until then.';
    }
    return '';
  }

  render(s: PlanStore, signer: () => string) {
    return html`${checklist(s).map((m, i) => {
        const missing = this.missing(m, i);
        return html`<div class="item" data-item=${String(m.id ?? '')}>
          <select
            aria-label=${`State of: ${m.text}`}
            @change=${(e: Event) => {
              const el = e.target as HTMLSelectElement;
              this.setState(s, i, el.value as ChecklistItem['state'], signer(), el);
            }}
          >
            ${(['open', 'done', 'n/a'] as const).map((st) => html`<option value=${st} .selected=${m.state === st}>${st}</option>`)}
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
              aria-invalid=${missing ? 'true' : 'false'}
              placeholder="who"
              .value=${String(m.who ?? '')}
              @change=${(e: Event) => this.setWho(s, i, (e.target as HTMLInputElement).value)}
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
              @click=${() => {
                this.reset();
                setChecklist(
                  s,
                  checklistRaw(s).filter((_, j) => j !== i),
                );
              }}
            >
              ✕
            </button>
            ${
              missing
                ? html`<span
                    class="field-error who-missing"
                    role=${this.pending.has(keyOf(m, i)) ? 'alert' : 'note'}
                    >${missing}</span
                  >`
                : ''
            }
          </div>
        </div>`;
      })}
      <div class="row">
        <button @click=${() => addItem(s)}>Add item</button>
        <button
          @click=${() => {
            this.reset();
            setChecklist(
              s,
              DEFAULT_MANUAL_ITEMS.map((m) => ({ ...m })),
            );
          }}
        >
          Reset to template
        </button>
      </div>`;
  }
}
