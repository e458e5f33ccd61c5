import { LitElement, css, html } from 'lit';
import { customElement, property, state } from 'lit/decorators.js';
import demo from '../../data/demo-plan.json';
import { briefHtml, briefSafety, CAUTION_TEXT } from '../brief';
import { toGeoJSON, toGPX, toKML, toScheduleCSV, toSitesCSV } from '../formats';
import { COORD_FORMATS, LENGTH_UNITS, SPEED_UNITS, type UnitPrefs } from './units';
import { type Plan, validatePlan } from '../plan';
import type { PlanResult } from '../planner';
import { PlanStore } from './plan-store';
import { DAMAGED_KEY } from './saved-state';
import { sharedStyles } from './shared-styles';
import { StoreController } from './store-controller';
import './sf-map';
import './sf-plan-panel';
import './sf-results-table';
import './sf-safety-panel';
import './sf-sites-panel';
import './sf-variants-panel';
import './sf-wind-panel';
import './sf-wind-sources';

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

/** A file name from a plan name: letters, digits, dots and dashes only. */
function fileBase(name: unknown): string {
  return (
    String(name ?? 'plan')
      .replace(/[^\w.-]+/g, '-')
      .replace(/^-+|-+$/g, '') || 'plan'
  );
}

/** Hands text to the browser as a file download. */
function download(text: string, type: string, name: string): void {
  const a = document.createElement('a');
  a.href = URL.createObjectURL(new Blob([text], { type }));
  a.download = name;
  a.click();
  setTimeout(() => URL.revokeObjectURL(a.href), 1000);
}

/**
 * The brief may run no script of its own (its Content-Security-Policy), so the app wires the
 * brief's print button once the tab (same origin: a blob URL of this page) has loaded it.
 */
function wirePrintButton(w: Window, triesLeft = 100): void {
  let button: Element | null | undefined;
  try {
    button = w.document?.querySelector('[data-action=print]');
  } catch {
    return; // the tab went elsewhere
  }
  if (button) button.addEventListener('click', () => w.print());
  else if (triesLeft > 0 && !w.closed) setTimeout(() => wirePrintButton(w, triesLeft - 1), 100);
}

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

  private async open(e: Event): Promise<void> {
    const input = e.target as HTMLInputElement;
    const file = input.files?.[0];
    input.value = '';
    if (!file) return;
    let raw: unknown;
    try {
      raw = JSON.parse(await file.text());
    } catch (err) {
      this.store.setNotice(
        'error',
        `${file.name} was not opened: it is not JSON (${(err as Error).message}). Your plan is unchanged.`,
      );
      return;
    }
    const v = validatePlan(raw);
    if (!v.ok) {
      const first = v.errors
        .slice(0, 4)
        .map((x) => x.message)
        .join('; ');
      const more = v.errors.length > 4 ? ` and ${v.errors.length - 4} more` : '';
      this.store.setNotice(
        'error',
        `${file.name} was not opened: ${first}${more}. Your plan is unchanged.`,
      );
      return;
    }
    this.store.replace(raw as Record<string, unknown>, `Opened ${file.name}.`);
  }

  private save(): void {
    const name = `${fileBase(this.store.get('name'))}.json`;
    download(`${JSON.stringify(this.store.draft, null, 2)}\n`, 'application/json', name);
    this.store.setNotice(
      this.store.valid ? 'info' : 'error',
      this.store.valid
        ? `Saved ${name}.`
        : `Saved ${name} — it still has problems to fix before it can be planned.`,
    );
  }

  /**
   * The plan and the result computed from it, for the brief and exports; null (with a notice)
   * while planning is still running, so a file never mixes an edited plan with an older result.
   */
  private computedPair(what: string): { plan: Plan; result: PlanResult } | null {
    const s = this.store;
    if (s.computing) {
      s.setNotice(
        'error',
        `Planning is still running for your latest edits; the ${what} waits for it — try again in a moment.`,
      );
      return null;
    }
    if (!s.resultPlan || !s.result) {
      s.setNotice('error', `No planning result yet: the ${what} needs a valid plan.`);
      return null;
    }
    if (s.resultPlan !== s.plan || !s.valid) {
      s.setNotice('error', `The plan has problems to fix; the ${what} shows the last valid plan.`);
    }
    return { plan: s.resultPlan, result: s.result };
  }

  /** Opens the printable brief of the current result in a new tab. */
  private openBrief(): void {
    const s = this.store;
    const pair = this.computedPair('brief');
    if (!pair) return;
    const html = briefHtml(pair.plan, pair.result, {
      paper: s.settings.paper,
      printBar: true,
      safety: s.safety ? briefSafety(s.safety) : undefined,
      sweep: s.sweep && s.sweep.plan === pair.plan ? s.sweep : undefined,
    });
    const url = URL.createObjectURL(new Blob([html], { type: 'text/html' }));
    const w = window.open(url, '_blank');
    if (!w) s.setNotice('error', 'The brief could not open: allow pop-ups for this page.');
    else wirePrintButton(w);
    setTimeout(() => URL.revokeObjectURL(url), 60_000);
  }

  /** Downloads one of the exchange formats of the current result. */
  private exportAs(kind: 'geojson' | 'kml' | 'gpx' | 'csv' | 'sites'): void {
    const s = this.store;
    const pair = this.computedPair('export');
    if (!pair) return;
    const { plan, result } = pair;
    const base = fileBase(plan.name);
    const hazard = s.safety?.hazardArea;
    const out: Record<typeof kind, [string, string, string]> = {
      geojson: [
        JSON.stringify(toGeoJSON(plan, result, hazard ? { hazardArea: hazard } : {}), null, 1),
        'application/geo+json',
        `${base}.geojson`,
      ],
      kml: [
        toKML(plan, result, hazard ? { hazardArea: hazard } : {}),
        'application/vnd.google-earth.kml+xml',
        `${base}.kml`,
      ],
      gpx: [toGPX(plan, result), 'application/gpx+xml', `${base}.gpx`],
      csv: [toScheduleCSV(plan, result, { bom: this.csvBom }), 'text/csv', `${base}-schedule.csv`],
      sites: [toSitesCSV(plan, { bom: this.csvBom }), 'text/csv', `${base}-sites.csv`],
    };
    const [text, type, name] = out[kind];
    download(text, type, name);
    s.setNotice('info', `Exported ${name}.`);
  }

  private setUnits(patch: Partial<UnitPrefs>): void {
    this.store.setSettings({ units: { ...this.store.settings.units, ...patch } });
  }

  private renderSettings() {
    const st = this.store.settings;
    return html`<div class="settings">
      <h3>Units</h3>
      <label
        >Lengths and altitudes
        <select
          data-setting="length"
          @change=${(e: Event) => this.setUnits({ length: (e.target as HTMLSelectElement).value as UnitPrefs['length'] })}
        >
          ${LENGTH_UNITS.map((u) => html`<option ?selected=${u === st.units.length}>${u}</option>`)}
        </select></label
      >
      <label
        >Speeds
        <select
          data-setting="speed"
          @change=${(e: Event) => this.setUnits({ speed: (e.target as HTMLSelectElement).value as UnitPrefs['speed'] })}
        >
          ${SPEED_UNITS.map((u) => html`<option ?selected=${u === st.units.speed}>${u}</option>`)}
        </select></label
      >
      <label
        >Coordinates
        <select
          data-setting="coords"
          @change=${(e: Event) => this.setUnits({ coords: (e.target as HTMLSelectElement).value as UnitPrefs['coords'] })}
        >
          ${COORD_FORMATS.map((u) => html`<option value=${u} ?selected=${u === st.units.coords}>${{ decimal: 'decimal degrees', dms: 'degrees minutes seconds', utm: 'UTM', mgrs: 'MGRS' }[u]}</option>`)}
        </select></label
      >
      <h3>Brief</h3>
      <label
        >Paper size
        <select
          data-setting="paper"
          @change=${(e: Event) =>
            this.store.setSettings({
              paper: (e.target as HTMLSelectElement).value as 'A4' | 'Letter',
            })}
        >
          ${(['A4', 'Letter'] as const).map((p) => html`<option ?selected=${p === st.paper}>${p}</option>`)}
        </select></label
      >
      <h3>Background map</h3>
      <p class="muted">
        Without a tile source the map shows a coordinate grid and scale only, which is all planning
        needs. When online, give a tile URL template with {z}, {x}, {y} and its attribution.
      </p>
      <label
        >Tile URL template
        <input
          data-setting="tileUrl"
          .value=${st.tileUrl}
          placeholder="https://…/{z}/{x}/{y}.png"
          @change=${(e: Event) => this.store.setSettings({ tileUrl: (e.target as HTMLInputElement).value.trim() })}
      /></label>
      <label
        >Attribution
        <input
          data-setting="tileAttribution"
          .value=${st.tileAttribution}
          @change=${(e: Event) => this.store.setSettings({ tileAttribution: (e.target as HTMLInputElement).value })}
      /></label>
    </div>`;
  }

  private renderPanel() {
    const s = this.store;
    switch (this.tab) {
      case 'results':
        return html`${
            s.issues.length
              ? html`<h3>Problems to fix</h3>
                  <ul class="issues">
                    ${s.issues.map((i) => html`<li>${i.message}</li>`)}
                  </ul>`
              : ''
          }
          <sf-results-table .store=${s}></sf-results-table>
          <div class="exports" role="group" aria-label="Export">
            <span class="muted">Export:</span>
            <button @click=${() => this.exportAs('geojson')}>GeoJSON</button>
            <button @click=${() => this.exportAs('kml')}>KML</button>
            <button @click=${() => this.exportAs('gpx')}>GPX</button>
            <button @click=${() => this.exportAs('csv')}>Schedule CSV</button>
            <button @click=${() => this.exportAs('sites')}>Sites CSV</button>
            <label class="muted"
              ><input
                type="checkbox"
                data-export="bom"
                .checked=${this.csvBom}
                @change=${(e: Event) => (this.csvBom = (e.target as HTMLInputElement).checked)}
              />
              CSV with byte-order mark (for spreadsheets)</label
            >
          </div>
          ${s.result?.warnings.map((w) => html`<p class="notice-error">${w}</p>`)}
          ${
            s.result
              ? html`<p class="muted">
                  Declination ${s.result.declination_deg?.toFixed(2) ?? '—'}°
                  (${s.result.declinationModel ?? 'unavailable'}).
                  ${
                    s.result.track.groundSpeed_mps > 0
                      ? 'Window times are seconds relative to passing the release point (negative = before).'
                      : 'Hovering: each site is planned from its own hover point.'
                  }
                </p>`
              : ''
          }`;
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
        return this.renderSettings();
    }
  }

  /** Downloads a damaged saved draft exactly as it was stored. */
  private downloadDamaged(): void {
    const d = this.store.damaged;
    if (!d) return;
    const stamp = (d.at || new Date().toISOString()).replace(/[^\dT]/g, '').slice(0, 15);
    download(d.text, 'text/plain', `seedfall-damaged-draft-${stamp}.txt`);
  }

  /** Standing alerts that must not scroll away: a damaged saved draft, autosave failures. */
  private renderAlerts() {
    const s = this.store;
    const d = s.damaged;
    const out = [];
    if (d) {
      const what = d.earlier
        ? html`A saved draft that could not be read${d.at ? ` (found ${d.at})` : ''} is still kept
          in browser storage under ${DAMAGED_KEY}.`
        : html`Your saved draft could not be read: ${d.reason}. The app started on the demo plan
          instead.
          ${
            d.stored
              ? html`The damaged draft is kept unchanged in browser storage under ${DAMAGED_KEY}
                until you delete it.`
              : html`Browser storage cannot hold a copy of it, so autosave is paused and the damaged
                draft stays where it was until you download or discard it.`
          }`;
      out.push(
        html`<div class="alert" role="alert" data-testid="damaged-draft">
          <p>${what}</p>
          <button data-testid="download-damaged" @click=${this.downloadDamaged}>
            Download damaged draft
          </button>
          ${
            d.stored
              ? html`<button data-testid="delete-damaged" @click=${() => s.deleteDamagedCopy()}>
                    Delete kept copy
                  </button>
                  <button data-testid="dismiss-damaged" @click=${() => s.dismissDamaged()}>
                    Dismiss
                  </button>`
              : html`<button data-testid="dismiss-damaged" @click=${() => s.dismissDamaged()}>
                  Discard it and resume autosave
                </button>`
          }
        </div>`,
      );
    }
    if (s.saveError) {
      out.push(
        html`<div class="alert" role="alert" data-testid="save-error">
          <p>${s.saveError}.</p>
        </div>`,
      );
    }
    return out;
  }

  private renderStatus() {
    const s = this.store;
    const parts = [];
    if (s.computing) {
      parts.push(
        html`<span data-testid="computing"
          >Planning… <progress max="1" .value=${s.progress}></progress
        ></span>`,
      );
    } else if (s.result) {
      parts.push(
        html`<span data-testid="planned"
          >Planned ${s.result.sites.length} sites in ${Math.round(s.elapsed_ms)} ms.</span
        >`,
      );
    }
    if (!s.valid) {
      const n = s.issues.length + s.texts.size;
      parts.push(
        html`<span class="invalid" data-testid="stale" role="status">
          ${n} problem${n === 1 ? '' : 's'} in the plan — the map shows the last valid result.</span
        >`,
      );
    }
    if (s.workerError)
      parts.push(html`<span class="notice-error">Planning failed: ${s.workerError}</span>`);
    if (s.notice) {
      parts.push(
        html`<span
          class=${s.notice.kind === 'error' ? 'notice-error' : ''}
          data-testid="notice"
          role="status"
          >${s.notice.text}</span
        >`,
      );
    }
    return parts;
  }

  render() {
    const s = this.store;
    return html`
      <header>
        <h1>Seedfall</h1>
        <span class="plan-name">${String(s.get('name') ?? 'Untitled plan')}</span>
        <label
          ><input
            type="file"
            accept=".json,application/json"
            hidden
            data-testid="open-file"
            @change=${this.open}
          />
          <button
            @click=${(e: Event) => ((e.currentTarget as HTMLElement).previousElementSibling as HTMLInputElement).click()}
          >
            Open…
          </button></label
        >
        <button @click=${this.save}>Save</button>
        <button @click=${this.openBrief} title="Printable drop brief for the field crew">
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
        ${this.renderAlerts()}
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
      <footer>${this.renderStatus()}</footer>
    `;
  }
}
