/** The <seedfall-app> element: the shell laying out toolbar, map, side panels and status line. */
import { LitElement, css, html } from 'lit';
import { customElement, property, state } from 'lit/decorators.js';
import demo from '../../data/demo-plan.json';
import { CAUTION_TEXT } from '../brief';
import { openBrief } from './brief-tab';
import { savePlan } from './downloads';
import { openPlanFile } from './open-plan';
import { takePickedFile } from './picked-file';
import { PlanStore } from './plan-store';
import { renderResultsTab } from './results-tab';
import { renderSettings } from './settings-form';
import { sharedStyles } from './shared-styles';
import { renderAlerts, renderStatus } from './status-area';
import { StoreController } from './store-controller';
import './sf-map';
import './sf-plan-panel';
import './sf-safety-panel';
import './sf-sites-panel';
import './sf-variants-panel';
import './sf-wind-panel';
import './sf-wind-sources';
import './plan-library';

type Tab = 'results' | 'safety' | 'plan' | 'winds' | 'sites' | 'variants' | 'settings';
const TABS: [Tab, string][] = [
  ['results', 'Results'],
  ['safety', 'Safety'],
  ['plan', 'Release & plan'],
  ['winds', 'Winds'],
  ['sites', 'Sites'],
  ['variants', 'Variants'],
  ['settings', 'Units & map'],
];

/** The application shell: toolbar, map, side panels, status line and the standing caution. */
@customElement('seedfall-app')
export class SeedfallApp extends LitElement {
  static styles = [
    sharedStyles,
    css`
      :host {
        display: grid;
        grid-template-rows: auto auto 1fr auto;
        height: 100vh;
        background: #fff;
      }
      header {
        display: flex;
        align-items: center;
        gap: 10px;
        padding: 6px 10px;
        background: #1f3a34;
        color: #fff;
        flex-wrap: wrap;
      }
      header h1 {
        font-size: 17px;
        margin: 0 10px 0 0;
        letter-spacing: 0.02em;
      }
      header .plan-name {
        opacity: 0.85;
        margin-right: auto;
      }
      header button {
        background: #2d5047;
        color: #fff;
        border-color: #4c7369;
      }
      header button:hover:not(:disabled) {
        background: #3a6358;
      }
      .caution {
        background: var(--sf-warn-bg);
        border-bottom: 1px solid var(--sf-warn-line);
        padding: 4px 10px;
        font-size: 13px;
      }
      .caution strong {
        color: #7a4d00;
      }
      .alert {
        background: #fdecea;
        border-bottom: 1px solid #f1b5ae;
        padding: 6px 10px;
        font-size: 13px;
        display: flex;
        gap: 8px;
        align-items: center;
        flex-wrap: wrap;
      }
      .alert p {
        margin: 0;
        flex: 1 1 30em;
      }
      .plan-warnings {
        background: #fffaf0;
        border-left: 4px solid var(--sf-warn-line);
        border-bottom: 1px solid var(--sf-warn-line);
        padding: 4px 10px;
        font-size: 13px;
        max-height: 9em;
        overflow: auto;
      }
      .plan-warnings ul {
        margin: 2px 0 0 18px;
        padding: 0;
      }
      .plan-warnings summary {
        cursor: pointer;
      }
      main {
        display: grid;
        grid-template-columns: minmax(0, 1fr) minmax(380px, 48%);
        min-height: 0;
      }
      sf-map {
        min-height: 0;
      }
      aside {
        border-left: 1px solid var(--sf-line);
        display: flex;
        flex-direction: column;
        min-height: 0;
      }
      nav {
        display: flex;
        flex-wrap: wrap;
        border-bottom: 1px solid var(--sf-line);
        background: var(--sf-panel);
      }
      nav button {
        border: none;
        border-radius: 0;
        background: none;
        padding: 7px 10px;
        border-bottom: 3px solid transparent;
      }
      nav button[aria-selected='true'] {
        border-bottom-color: var(--sf-accent);
        font-weight: 600;
      }
      .panel {
        overflow: auto;
        padding: 4px 12px 16px;
        flex: 1;
      }
      footer {
        display: flex;
        gap: 12px;
        align-items: center;
        padding: 4px 10px;
        border-top: 1px solid var(--sf-line);
        background: var(--sf-panel);
        font-size: 13px;
        min-height: 26px;
      }
      .notice-error,
      .invalid {
        color: var(--sf-bad);
        font-weight: 600;
      }
      progress {
        width: 120px;
      }
      .exports {
        display: flex;
        gap: 6px;
        flex-wrap: wrap;
        align-items: center;
        margin: 10px 0;
      }
      .settings label {
        display: grid;
        grid-template-columns: 1fr 14em;
        gap: 6px;
        margin: 4px 0;
        align-items: center;
      }
      .issues li {
        color: var(--sf-bad);
      }
      @media (max-width: 900px) {
        :host {
          height: auto;
        }
        main {
          grid-template-columns: 1fr;
          grid-template-rows: 60vh auto;
        }
        aside {
          border-left: none;
          border-top: 1px solid var(--sf-line);
        }
      }
    `,
  ];

  @property({ attribute: false }) store = new PlanStore(demo as Record<string, unknown>);
  @state() private tab: Tab = 'results';
  /** CSV downloads start with a UTF-8 byte-order mark (spreadsheets then read accents right). */
  @state() private csvBom = false;

  constructor() {
    super();
    new StoreController(this, () => this.store);
  }

  connectedCallback(): void {
    super.connectedCallback();
    window.addEventListener('keydown', this.onKey);
    window.addEventListener('pagehide', this.onHide);
  }

  disconnectedCallback(): void {
    window.removeEventListener('keydown', this.onKey);
    window.removeEventListener('pagehide', this.onHide);
    super.disconnectedCallback();
  }

  private readonly onHide = (): void => this.store.flush();

  private readonly onKey = (e: KeyboardEvent): void => {
    if (!(e.ctrlKey || e.metaKey)) return;
    const target = e.composedPath()[0] as HTMLElement | undefined;
    if (target && (target.tagName === 'INPUT' || target.tagName === 'SELECT')) return;
    const k = e.key.toLowerCase();
    if (k === 'z' && !e.shiftKey) {
      e.preventDefault();
      this.store.undo();
    } else if (k === 'y' || (k === 'z' && e.shiftKey)) {
      e.preventDefault();
      this.store.redo();
    }
  };

  private renderPanel() {
    const s = this.store;
    switch (this.tab) {
      case 'results':
        return renderResultsTab(s, this.csvBom, (on) => (this.csvBom = on));
      case 'safety':
        return html`<sf-safety-panel .store=${s}></sf-safety-panel>`;
      case 'plan':
        return html`<sf-plan-panel .store=${s}></sf-plan-panel>`;
      case 'winds':
        return html`<sf-wind-panel .store=${s}></sf-wind-panel>
          <sf-wind-sources .store=${s}></sf-wind-sources>`;
      case 'sites':
        return html`<sf-sites-panel .store=${s}></sf-sites-panel>`;
      case 'variants':
        return html`<sf-variants-panel .store=${s}></sf-variants-panel>`;
      case 'settings':
        return renderSettings(s);
    }
  }

  render() {
    const s = this.store;
    return html`
      <header>
        <h1>Seedfall</h1>
        <span class="plan-name">${String(s.get('name') ?? 'Untitled plan')}</span>
        <button data-testid="open-library" @click=${() => s.library.showView()}>Plans…</button>
        <sf-plan-library .store=${s}></sf-plan-library>
        <label
          ><input
            type="file"
            accept=".json,application/json"
            hidden
            data-testid="open-file"
            @change=${(e: Event) => openPlanFile(s, takePickedFile(e))}
          />
          <button
            @click=${(e: Event) => ((e.currentTarget as HTMLElement).previousElementSibling as HTMLInputElement).click()}
          >
            Open…
          </button></label
        >
        <button @click=${() => savePlan(s)}>Save</button>
        <button @click=${() => openBrief(s)} title="Printable drop brief for the field crew">
          Brief
        </button>
        <button ?disabled=${!s.canUndo} @click=${() => s.undo()} title="Undo (Ctrl+Z)">Undo</button>
        <button ?disabled=${!s.canRedo} @click=${() => s.redo()} title="Redo (Ctrl+Y)">Redo</button>
        <button @click=${() => s.replace(demo as Record<string, unknown>, 'Demo plan loaded.')}>
          Demo plan
        </button>
      </header>
      <div>
        <div class="caution" role="note"><strong>Caution:</strong> ${CAUTION_TEXT}</div>
        ${renderAlerts(s)}
      </div>
      <main>
        <sf-map .store=${s}></sf-map>
        <aside>
          <nav role="tablist">
            ${TABS.map(
              ([t, label]) =>
                html`<button
                  role="tab"
                  data-tab=${t}
                  aria-selected=${this.tab === t ? 'true' : 'false'}
                  @click=${() => (this.tab = t)}
                >
                  ${label}
                </button>`,
            )}
          </nav>
          <div class="panel" role="tabpanel">${this.renderPanel()}</div>
        </aside>
      </main>
      <footer>${renderStatus(s)}</footer>
    `;
  }
}
