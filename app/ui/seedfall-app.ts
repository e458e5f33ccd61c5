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
      /* On the dark header the ring is white (12:1 on its green, 9:1 on a button). */
      header button:focus-visible {
        outline-color: #fff;
        box-shadow: none;
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
      /* The panels come first in the page (the tab order reaches them in a few steps), the map
         is drawn on their left. */
      main {
        display: grid;
        grid-template-columns: minmax(0, 1fr) minmax(380px, 48%);
        grid-template-areas: 'map panels';
        min-height: 0;
      }
      sf-map {
        grid-area: map;
        min-height: 0;
      }
      aside {
        grid-area: panels;
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
      /* Off screen until it has the keyboard focus, then over the header's top left corner. */
      .skip {
        position: absolute;
        left: 8px;
        top: 0;
        z-index: 2000;
        padding: 6px 12px;
        background: #fff;
        color: var(--sf-ink);
        border: 2px solid var(--sf-accent);
        border-radius: 0 0 4px 4px;
        font-weight: 600;
        transform: translateY(-120%);
      }
      .skip:focus {
        transform: none;
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
          grid-template-areas: 'map' 'panels';
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
    this.addEventListener('sf-open-site', this.onOpenSite);
    window.addEventListener('keydown', this.onKey);
    window.addEventListener('pagehide', this.onHide);
  }

  disconnectedCallback(): void {
    window.removeEventListener('keydown', this.onKey);
    window.removeEventListener('pagehide', this.onHide);
    super.disconnectedCallback();
  }

  private readonly onHide = (): void => this.store.flush();

  /** A view (the map, from the keyboard) asks for a site's details: the results tab shows them. */
  private readonly onOpenSite = (e: Event): void => {
    const id = (e as CustomEvent<string>).detail;
    this.tab = 'results';
    void this.updateComplete.then(() => this.store.openSite(id));
  };

  /** The selected tab's button. */
  private selectedTab(): HTMLElement | null {
    return this.renderRoot.querySelector<HTMLElement>('[role=tab][aria-selected=true]');
  }

  /** Selects a tab and gives its button the focus (arrow keys, Home, End on the tab list). */
  private async moveToTab(t: Tab): Promise<void> {
    this.tab = t;
    await this.updateComplete;
    this.selectedTab()?.focus();
  }

  /** The WAI-ARIA tabs pattern with automatic activation: Left/Right wrap, Home/End. */
  private onTabKey(e: KeyboardEvent): void {
    const i = TABS.findIndex(([t]) => t === this.tab);
    const n = TABS.length;
    const to: Record<string, number> = {
      ArrowLeft: (i - 1 + n) % n,
      ArrowRight: (i + 1) % n,
      Home: 0,
      End: n - 1,
    };
    if (!(e.key in to) || e.altKey || e.ctrlKey || e.metaKey) return;
    e.preventDefault();
    void this.moveToTab(TABS[to[e.key]][0]);
  }

  /** The skip link: focus to the selected panel tab (no change of the page's address). */
  private skipToPanels(e: Event): void {
    e.preventDefault();
    this.selectedTab()?.focus();
  }

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
        <a class="skip" href="#panel-tabs" @click=${(e: Event) => this.skipToPanels(e)}
          >Skip to the panels</a
        >
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
      <div role="region" aria-label="Caution and notices">
        <div class="caution" role="note"><strong>Caution:</strong> ${CAUTION_TEXT}</div>
        ${renderAlerts(s)}
      </div>
      <main>
        <aside>
          <nav
            id="panel-tabs"
            role="tablist"
            aria-label="Panels"
            @keydown=${(e: KeyboardEvent) => this.onTabKey(e)}
          >
            ${TABS.map(
              ([t, label]) =>
                html`<button
                  role="tab"
                  id=${`tab-${t}`}
                  data-tab=${t}
                  aria-controls=${`panel-${t}`}
                  aria-selected=${this.tab === t ? 'true' : 'false'}
                  tabindex=${this.tab === t ? '0' : '-1'}
                  @click=${() => (this.tab = t)}
                >
                  ${label}
                </button>`,
            )}
          </nav>
          ${TABS.map(([t]) =>
            t === this.tab
              ? html`<div
                  class="panel"
                  role="tabpanel"
                  id=${`panel-${t}`}
                  aria-labelledby=${`tab-${t}`}
                >
                  ${this.renderPanel()}
                </div>`
              : html`<div
                  role="tabpanel"
                  id=${`panel-${t}`}
                  aria-labelledby=${`tab-${t}`}
                  hidden
                ></div>`,
          )}
        </aside>
        <sf-map .store=${s}></sf-map>
      </main>
      <footer>${renderStatus(s)}</footer>
    `;
  }
}
