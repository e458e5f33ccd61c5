/**
 * The <sf-plan-library> dialog: the plans kept in this browser (name, last change, size) with
 * open, duplicate, rename, delete (Undo until the next delete), import and export. Names come
 * from storage and files: shown as text through Lit bindings, never as HTML.
 */
import { css, html } from 'lit';
import { customElement, query, state } from 'lit/decorators.js';
import { MAX_NAME_CHARS, MAX_PLANS, type PlanSummary } from './library-store';
import { sizeText } from './library-link';
import { takePickedFile } from './picked-file';
import { errorText } from './safe-storage';
import { sharedStyles } from './shared-styles';
import { StoreElement } from './store-element';

/** A change time for the list: local date and minute, or the stored text when it is not a time. */
function when(iso: string): string {
  const t = Date.parse(iso);
  if (!Number.isFinite(t)) return iso || '—';
  const d = new Date(t);
  const p = (n: number) => String(n).padStart(2, '0');
  return `${d.getFullYear()}-${p(d.getMonth() + 1)}-${p(d.getDate())} ${p(d.getHours())}:${p(d.getMinutes())}`;
}

@customElement('sf-plan-library')
export class PlanLibraryView extends StoreElement {
  static styles = [
    sharedStyles,
    css`
      dialog {
        width: min(760px, 94vw);
        max-height: 86vh;
        border: 1px solid var(--sf-line);
        border-radius: 6px;
        padding: 0;
      }
      dialog::backdrop {
        background: rgb(20 30 28 / 45%);
      }
      .head {
        display: flex;
        align-items: center;
        gap: 8px;
        padding: 8px 12px;
        background: var(--sf-panel);
        border-bottom: 1px solid var(--sf-line);
      }
      .head h2 {
        margin: 0;
        margin-right: auto;
      }
      .body {
        padding: 8px 12px 12px;
        overflow: auto;
        max-height: calc(86vh - 50px);
      }
      .tools {
        display: flex;
        gap: 8px;
        align-items: center;
        flex-wrap: wrap;
        margin-bottom: 8px;
      }
      td.name {
        overflow-wrap: anywhere;
        max-width: 22em;
      }
      td.when,
      td.size {
        white-space: nowrap;
      }
      td.size .dem {
        white-space: normal;
        overflow-wrap: anywhere;
        max-width: 12em;
      }
      td.actions {
        white-space: nowrap;
        text-align: right;
      }
      td.actions button {
        padding: 2px 7px;
        font-size: 13px;
      }
      tr.current td {
        background: #eef6f3;
      }
      .tag {
        font-size: 12px;
        color: var(--sf-accent);
        font-weight: 600;
        margin-left: 4px;
      }
      .trash {
        background: var(--sf-warn-bg);
        border: 1px solid var(--sf-warn-line);
        border-radius: 4px;
        padding: 4px 8px;
        margin-bottom: 8px;
        display: flex;
        gap: 8px;
        align-items: center;
      }
      .message {
        margin: 0 0 8px;
      }
      .message.error {
        color: var(--sf-bad);
        font-weight: 600;
      }
      .rename input {
        width: 100%;
      }
    `,
  ];

  @query('dialog') private dialog!: HTMLDialogElement;
  @state() private plans: PlanSummary[] = [];
  @state() private busy = false;
  @state() private message: { kind: 'info' | 'error'; text: string } | null = null;
  /** The plan whose name is being edited, the text typed and its problem. */
  @state() private renaming: { id: string; text: string; problem: string | null } | null = null;

  private readonly onShow = (): void => void this.show();

  connectedCallback(): void {
    super.connectedCallback();
    this.store?.addEventListener('show-library', this.onShow);
  }

  disconnectedCallback(): void {
    this.store?.removeEventListener('show-library', this.onShow);
    super.disconnectedCallback();
  }

  /** Opens the dialog with a fresh list. */
  async show(): Promise<void> {
    await this.updateComplete;
    if (!this.dialog.open) this.dialog.showModal();
    this.message = null;
    await this.refresh();
  }

  private async refresh(): Promise<void> {
    try {
      this.plans = await this.store!.library.list();
    } catch (e) {
      this.message = {
        kind: 'error',
        text: `The plan library could not be read: ${errorText(e)}.`,
      };
    }
  }

  /** Runs an action, then lists again; what it tells the store's notice is shown here too. */
  private async act(what: string, f: () => Promise<void>): Promise<void> {
    this.busy = true;
    const s = this.store!;
    const before = s.notice;
    try {
      await f();
      this.message = s.notice !== before && s.notice ? { ...s.notice } : null;
    } catch (e) {
      const why = errorText(e);
      this.message = {
        kind: 'error',
        text: `${what} failed: ${why}${/[.!?]$/.test(why) ? '' : '.'}`,
      };
    } finally {
      this.busy = false;
    }
    await this.refresh();
  }

  private async saveName(): Promise<void> {
    const r = this.renaming;
    if (!r) return;
    let problem: string | null = null;
    await this.act('Rename', async () => {
      problem = await this.store!.library.rename(r.id, r.text);
    });
    if (problem) this.renaming = { ...r, problem };
    else this.renaming = null;
  }

  private renderName(p: PlanSummary, current: boolean) {
    const r = this.renaming;
    if (r?.id === p.id) {
      return html`<td class="name rename">
        <input
          data-testid="rename-input"
          aria-label="New name for the plan"
          maxlength=${MAX_NAME_CHARS + 50}
          .value=${r.text}
          aria-invalid=${r.problem ? 'true' : 'false'}
          @input=${(e: Event) =>
            (this.renaming = { ...r, text: (e.target as HTMLInputElement).value, problem: null })}
          @keydown=${(e: KeyboardEvent) => {
            if (e.key === 'Enter') void this.saveName();
            if (e.key === 'Escape') {
              e.preventDefault();
              this.renaming = null;
            }
          }}
        />
        ${
          r.problem
            ? html`<div class="field-error" data-testid="rename-error">${r.problem}</div>`
            : ''
        }
      </td>`;
    }
    return html`<td class="name" data-testid="plan-name">
      ${p.name}${current ? html`<span class="tag">open</span>` : ''}
    </td>`;
  }

  private renderRow(p: PlanSummary) {
    const lib = this.store!.library;
    const current = p.id === lib.id;
    const editing = this.renaming?.id === p.id;
    return html`<tr class=${current ? 'current' : ''} data-plan=${p.id}>
      ${this.renderName(p, current)}
      <td class="when">${when(p.updatedAt)}</td>
      <td class="size">
        ${sizeText(p.bytes)}${p.demName ? html`<div class="muted dem">with ${p.demName}</div>` : ''}${
          p.basemapName
            ? html`<div class="muted dem" data-testid="plan-basemap">
                base map ${p.basemapName}
              </div>`
            : ''
        }
      </td>
      <td class="actions">
        ${
          editing
            ? html`<button data-testid="rename-save" @click=${() => this.saveName()}>
                  Save name
                </button>
                <button @click=${() => (this.renaming = null)}>Cancel</button>`
            : html`<button
                  data-testid="open-plan"
                  aria-label="Open “${p.name}”"
                  ?disabled=${current || this.busy}
                  @click=${() =>
                    this.act('Open', async () => {
                      await lib.open(p.id);
                      if (lib.id === p.id) this.dialog.close();
                    })}
                >
                  Open
                </button>
                <button
                  data-testid="duplicate-plan"
                  aria-label="Duplicate “${p.name}”"
                  ?disabled=${this.busy}
                  @click=${() => this.act('Duplicate', () => lib.duplicate(p.id))}
                >
                  Duplicate
                </button>
                <button
                  data-testid="rename-plan"
                  aria-label="Rename “${p.name}”"
                  ?disabled=${this.busy}
                  @click=${() => (this.renaming = { id: p.id, text: p.name, problem: null })}
                >
                  Rename
                </button>
                <button
                  data-testid="export-plan"
                  aria-label="Export “${p.name}”"
                  ?disabled=${this.busy}
                  @click=${() => this.act('Export', () => lib.exportPlan(p.id))}
                >
                  Export
                </button>
                <button
                  data-testid="delete-plan"
                  aria-label="Delete “${p.name}”"
                  ?disabled=${current || this.busy}
                  title=${current ? 'The plan being edited: open another plan to delete this one' : ''}
                  @click=${() => this.act('Delete', () => lib.remove(p.id))}
                >
                  Delete
                </button>`
        }
      </td>
    </tr>`;
  }

  render() {
    const s = this.store;
    if (!s) return html``;
    const lib = s.library;
    const trash = lib.trash;
    return html`<dialog aria-labelledby="plans-title" data-testid="plan-library">
      <div class="head">
        <h2 id="plans-title">Plans in this browser</h2>
        <button data-testid="close-library" @click=${() => this.dialog.close()}>Close</button>
      </div>
      <div class="body">
        ${
          lib.failure !== null && !lib.active
            ? html`<p class="message error">
                The plan library cannot be used in this browser: autosave keeps the one plan being
                edited. Save it to a file to keep it.
              </p>`
            : ''
        }
        <div class="tools">
          <label
            ><input
              type="file"
              accept=".json,application/json"
              hidden
              data-testid="import-file"
              @change=${(e: Event) => {
                const f = takePickedFile(e);
                if (f) void this.act('Import', () => lib.importFile(f));
              }}
            /><button
              ?disabled=${this.busy}
              @click=${(e: Event) =>
                (
                  (e.currentTarget as HTMLElement).previousElementSibling as HTMLInputElement
                ).click()}
            >
              Import plan file…
            </button></label
          >
          <span class="muted"
            >${this.plans.length} of at most ${MAX_PLANS} plans. Autosave writes to the open
            plan.</span
          >
        </div>
        ${
          this.message
            ? html`<p
                class="message ${this.message.kind === 'error' ? 'error' : ''}"
                role="status"
                data-testid="library-message"
              >
                ${this.message.text}
              </p>`
            : ''
        }
        ${
          trash
            ? html`<div class="trash" role="status" data-testid="library-trash">
                <span>Deleted “${trash.rec.name}”.</span>
                <button
                  data-testid="undo-delete"
                  ?disabled=${this.busy}
                  @click=${() => this.act('Undo', () => lib.undoDelete())}
                >
                  Undo
                </button>
              </div>`
            : ''
        }
        <table>
          <thead>
            <tr>
              <th>Name</th>
              <th>Last change</th>
              <th>Size</th>
              <th><span class="muted">Actions</span></th>
            </tr>
          </thead>
          <tbody>
            ${this.plans.map((p) => this.renderRow(p))}
          </tbody>
        </table>
      </div>
    </dialog>`;
  }
}

declare global {
  interface HTMLElementTagNameMap {
    'sf-plan-library': PlanLibraryView;
  }
}
