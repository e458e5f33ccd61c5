import { css, html } from 'lit';
import { customElement, state } from 'lit/decorators.js';
import { type ErrorSource, includedText, pHitParts, type SiteResult } from '../planner';
import type { PlanStore } from './plan-store';
import { formatQuantity } from './units';
import { sharedStyles } from './shared-styles';
import { StoreElement } from './store-element';

type Key = 'id' | 'variant' | 'pHit' | 'cep_m' | 'reachable' | 'open' | 'heading' | 'thrust';

const num = (v: number | null | undefined, d = 1): string =>
  v === null || v === undefined || !Number.isFinite(v)
    ? '–'
    : (Number(v.toFixed(d)) || 0).toFixed(d);

function sortValue(r: SiteResult, k: Key): number | string {
  switch (k) {
    case 'id':
      return r.id;
    case 'variant':
      return r.variant;
    case 'pHit':
      return r.pHit;
    case 'cep_m':
      return r.cep_m;
    case 'reachable':
      return r.reachable ? 1 : 0;
    case 'open':
      return r.releaseWindow?.open_s ?? Infinity;
    case 'heading':
      return r.headingTrue_deg ?? Infinity;
    case 'thrust':
      return r.thrustTime_s ?? Infinity;
  }
}

/** P(hit) with its standard error in a smaller, muted type: "0.91 ± 0.01" as text. */
function pHitCell(r: SiteResult) {
  const { p, se } = pHitParts(r.pHit, r.pHitSE);
  return se === null ? p : html`${p}<span class="se"> ± ${se}</span>`;
}

/**
 * The Variant cell: the chosen variant (a pin says so), or "none can reach" when no variant can
 * reach an unpinned site; the recommendation's reason as its tooltip.
 */
function variantCell(x: SiteResult) {
  const rec = x.recommendation;
  if (rec.kind === 'unreachable' && !x.pinned)
    return html`<td class="bad" data-col="variant" title=${rec.why}>none can reach</td>`;
  return html`<td data-col="variant" title=${rec.why}>
    ${x.variant}${x.pinned ? html`<span class="muted" title=${`pinned by the site; recommended: ${x.recommended}`}> (pin)</span>` : ''}
  </td>`;
}

/** "Included error sources: a, b, c." with each source's size and origin as its tooltip. */
function includedLine(sources: readonly ErrorSource[]) {
  if (sources.length === 0)
    return html`<p class="included" data-testid="included">${includedText(sources)}</p>`;
  return html`<p class="included" data-testid="included">
    Included error sources:
    ${sources.map(
      (e, i) =>
        html`<span class="source" data-source=${e.id} title=${e.detail}>${e.label}</span
          >${i < sources.length - 1 ? ', ' : '.'}`,
    )}
    <span class="muted">P(hit) ± its Monte Carlo standard error.</span>
  </p>`;
}

/**
 * Per-site results of the latest plan: sortable; a row (click, Enter or Space) opens the site's
 * details and shows it on the map. The rows are one tab stop (roving focus: the row last
 * focused, else the selected site's, else the first; Up, Down, Page Up, Page Down, Home and End
 * move between rows), so a plan of a thousand sites is not a thousand Tab presses.
 */
@customElement('sf-results-table')
export class SfResultsTable extends StoreElement {
  static styles = [
    sharedStyles,
    css`
      :host {
        display: block;
      }
      th button {
        border: none;
        background: none;
        padding: 0;
        font: inherit;
        color: inherit;
        cursor: pointer;
      }
      tbody tr {
        cursor: pointer;
      }
      tbody tr:hover {
        background: #eef5f2;
      }
      tbody tr.selected {
        background: #dff0ea;
        box-shadow: inset 3px 0 0 var(--sf-accent);
      }
      tbody tr:focus-visible {
        outline: 2px solid var(--sf-accent);
        outline-offset: -2px;
      }
      .bad {
        color: var(--sf-bad);
        font-weight: 600;
      }
      .good {
        color: var(--sf-good);
      }
      .scroll {
        overflow-x: auto;
      }
      .se {
        color: var(--sf-muted);
        font-weight: 400;
        font-size: 11px;
      }
      .included {
        font-size: 12px;
        margin: 4px 0 6px;
      }
      .source {
        text-decoration: underline dotted;
        cursor: help;
      }
      /* 2 px between columns keeps all nine inside the panel of a 1280 px screen. */
      td,
      th {
        white-space: nowrap;
        font-size: 13px;
        padding: 3px 2px;
      }
    `,
  ];

  @state() private key: Key = 'id';
  @state() private asc = true;
  /** The row (site id) that is the table's tab stop, once one has had the focus. */
  @state() private current: string | null = null;

  private listening?: PlanStore;
  private readonly onSelect = (): void => this.requestUpdate();

  connectedCallback(): void {
    super.connectedCallback();
    this.listening = this.store;
    this.listening?.addEventListener('select-site', this.onSelect);
  }

  disconnectedCallback(): void {
    super.disconnectedCallback();
    this.listening?.removeEventListener('select-site', this.onSelect);
    this.listening = undefined;
  }

  /** Opens the site's details and shows it on the map. */
  private open(id: string): void {
    this.store?.selectSite(id);
    this.store?.focusSite(id);
  }

  private onRowKey(e: KeyboardEvent, id: string): void {
    if (e.target !== e.currentTarget) return;
    const row = e.currentTarget as HTMLElement;
    const to = this.rowFor(row, e.key);
    if (to) {
      e.preventDefault();
      to.focus();
      return;
    }
    if (e.key === 'Enter' || e.key === ' ') {
      e.preventDefault();
      this.open(id);
    } else if (e.key === 'Escape' && this.store?.selectedSite !== null) {
      e.preventDefault();
      this.store?.selectSite(null);
    }
  }

  /** The row a moving key leads to from `row` (null: not a moving key, or no row there). */
  private rowFor(row: HTMLElement, key: string): HTMLElement | null {
    const rows = (): HTMLElement[] => [
      ...(row.parentElement?.querySelectorAll<HTMLElement>(':scope > tr') ?? []),
    ];
    const page = 10;
    switch (key) {
      case 'ArrowDown':
        return row.nextElementSibling as HTMLElement | null;
      case 'ArrowUp':
        return row.previousElementSibling as HTMLElement | null;
      case 'Home':
        return rows()[0] ?? null;
      case 'End':
        return rows().at(-1) ?? null;
      case 'PageDown':
      case 'PageUp': {
        const all = rows();
        const i = all.indexOf(row) + (key === 'PageDown' ? page : -page);
        return all[Math.max(0, Math.min(all.length - 1, i))] ?? null;
      }
      default:
        return null;
    }
  }

  private sortBy(k: Key): void {
    if (this.key === k) this.asc = !this.asc;
    else {
      this.key = k;
      this.asc = true;
    }
  }

  render() {
    const s = this.store;
    const r = s?.result;
    if (!s) return html``;
    if (!r) {
      // Say why there is no result yet instead of promising one that will not come.
      if (s.workerError)
        return html`<p class="bad" data-testid="no-result">
          No result: planning failed — ${s.workerError}.
        </p>`;
      if (!s.plan)
        return html`<p class="bad" data-testid="no-result">
          No result: the plan has problems to fix first (listed above and beside the fields).
        </p>`;
      return html`<p class="muted">Planning…</p>`;
    }
    const moving = r.track.groundSpeed_mps > 0;
    const rows = [...r.sites].sort((a, b) => {
      const x = sortValue(a, this.key);
      const y = sortValue(b, this.key);
      const c = typeof x === 'string' ? x.localeCompare(String(y)) : x - (y as number);
      return this.asc ? c : -c;
    });
    const u = s.settings.units;
    const selected = s.selectedSite;
    // The one row in the tab order: the last focused, else the selected site's, else the first.
    const has = (id: string | null) => id !== null && rows.some((x) => x.id === id);
    const stop = has(this.current)
      ? this.current
      : has(selected)
        ? selected
        : (rows[0]?.id ?? null);
    const h = (k: Key, label: string, title = '') => {
      const sorted = this.key === k ? (this.asc ? 'ascending' : 'descending') : 'none';
      return html`<th aria-sort=${sorted} title=${title}>
        <button @click=${() => this.sortBy(k)}>
          ${label}${this.key === k ? (this.asc ? ' ▲' : ' ▼') : ''}
        </button>
      </th>`;
    };
    return html`
      <div class="scroll">
        <table data-testid="results">
          <thead>
            <tr>
              ${h('id', 'Site')}
              ${h('variant', 'Variant', 'Chosen variant (pinned or recommended)')}
              ${h('pHit', 'P(hit)', 'Share of the samples landing within tolerance, ± its Monte Carlo standard error √(p(1−p)/n)')}
              ${h('cep_m', 'CEP')} ${h('reachable', 'Reach')}
              ${
                moving
                  ? h(
                      'open',
                      'Window s',
                      'Release window: opens … closes, s relative to passing the release point',
                    )
                  : html`<th>Hover zone</th>`
              }
              ${h('heading', 'Hdg T/M °', 'Programmed heading, true / magnetic')}
              ${h('thrust', 'Thrust s', 'Programmed thrust time')}
            </tr>
          </thead>
          <tbody>
            ${rows.map(
              (x) =>
                html`<tr
                  data-site=${x.id}
                  tabindex=${x.id === stop ? '0' : '-1'}
                  @focus=${() => (this.current = x.id)}
                  aria-selected=${selected === x.id ? 'true' : 'false'}
                  class=${selected === x.id ? 'selected' : ''}
                  @click=${() => this.open(x.id)}
                  @keydown=${(e: KeyboardEvent) => this.onRowKey(e, x.id)}
                  title=${`${x.name}: details, and show on the map`}
                >
                  <td>${x.id}</td>
                  ${variantCell(x)}
                  <td class=${`num ${x.meetsRequired ? 'good' : 'bad'}`} data-col="phit">
                    ${pHitCell(x)}
                  </td>
                  <td class="num">${formatQuantity(x.cep_m, 'distance', u)}</td>
                  <td class=${x.reachable ? 'good' : 'bad'}>${x.reachable ? 'yes' : 'no'}</td>
                  ${
                    moving
                      ? html`<td class="num" data-col="window">
                          ${x.releaseWindow ? `${num(x.releaseWindow.open_s)}…${num(x.releaseWindow.close_s)}` : 'none'}
                        </td>`
                      : html`<td data-col="zone">
                          ${x.releaseZone ? `r ${formatQuantity(x.releaseZone.radius_m, 'distance', u)}` : 'none'}
                        </td>`
                  }
                  <td class="num">
                    ${x.headingTrue_deg === undefined ? '–' : `${num(x.headingTrue_deg, 0)} / ${num(x.headingMag_deg, 0)}`}
                  </td>
                  <td class="num">${num(x.thrustTime_s)}</td>
                </tr>`,
            )}
          </tbody>
        </table>
      </div>
      ${includedLine(r.errorSources)}
    `;
  }
}
