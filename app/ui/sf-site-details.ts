/**
 * The site details view: every variant side by side for the selected site (reach, P(hit) ± its
 * standard error, CEP, release window or hover zone, heading programme, impact energy, cost), the
 * chosen one marked with the reason, the landing scatter of its Monte Carlo samples with the
 * ellipses and the tolerance, and its fall profile. Opened by store.selectSite (a results row, a
 * map marker, the keyboard); closed by Escape or the close button.
 */
import { css, html, nothing, type PropertyValues } from 'lit';
import { customElement, query, state } from 'lit/decorators.js';
import { unsafeSVG } from 'lit/directives/unsafe-svg.js';
import { fallProfileSvg, groundProfileSvg, scatterSvg } from '../brief';
import { distance_m } from '../model';
import type { Dem } from '../formats';
import type { Plan } from '../plan';
import {
  pHitParts,
  type SiteResult,
  type SiteSamples,
  siteSamples,
  type VariantResult,
} from '../planner';
import { siteTouchdowns, type Touchdown } from '../safety';
import type { PlanStore } from './plan-store';
import { sharedStyles } from './shared-styles';
import { StoreElement } from './store-element';
import { formatQuantity, formatSpeed, toDisplayLength, type UnitPrefs } from './units';

const num = (v: number | null | undefined, d = 1): string =>
  v === null || v === undefined || !Number.isFinite(v)
    ? '–'
    : (Number(v.toFixed(d)) || 0).toFixed(d);

/** The release window in the results table's words ("open…close" s), with the best time. */
export function windowText(v: VariantResult): string {
  const w = v.releaseWindow;
  return w ? `${num(w.open_s)}…${num(w.close_s)} s, best ${num(w.best_s)} s` : 'none';
}

/** The element with focus, looking into shadow roots. */
function deepActive(): HTMLElement | null {
  let a: Element | null = document.activeElement;
  while (a?.shadowRoot?.activeElement) a = a.shadowRoot.activeElement;
  return a instanceof HTMLElement ? a : null;
}

// Monte Carlo re-flights kept for the shown result: a few site × variant pairs, never more.
const CACHE_MAX = 12;

/** Details of the selected site: variants side by side, the landing scatter and the fall. */
@customElement('sf-site-details')
export class SfSiteDetails extends StoreElement {
  static styles = [
    sharedStyles,
    css`
      :host {
        display: block;
      }
      section {
        border: 1px solid var(--sf-line);
        border-left: 4px solid var(--sf-accent);
        border-radius: 4px;
        padding: 6px 10px 10px;
        margin: 6px 0 12px;
        background: #fff;
      }
      header {
        display: flex;
        align-items: baseline;
        gap: 8px;
      }
      h2 {
        flex: 1;
        margin: 2px 0 6px;
        overflow-wrap: anywhere;
      }
      h2:focus {
        outline: none;
      }
      h2:focus-visible {
        outline: 2px solid var(--sf-accent);
      }
      .why {
        margin: 0 0 6px;
      }
      .alert {
        color: var(--sf-bad);
        background: #fff5f4;
        border: 1px solid var(--sf-bad);
        border-radius: 4px;
        padding: 6px 8px;
        font-weight: 700;
        font-size: 15px;
        margin: 0 0 6px;
      }
      .scroll {
        overflow-x: auto;
      }
      th,
      td {
        font-size: 13px;
        padding: 3px 6px;
        white-space: nowrap;
      }
      thead th {
        overflow-wrap: anywhere;
        white-space: normal;
        min-width: 6em;
      }
      tbody th {
        color: var(--sf-muted);
      }
      .chosen {
        background: #e7f4ef;
      }
      thead .chosen {
        color: var(--sf-accent);
      }
      .mark {
        display: block;
        font-size: 11px;
      }
      .bad {
        color: var(--sf-bad);
        font-weight: 600;
      }
      .good {
        color: var(--sf-good);
      }
      .se {
        color: var(--sf-muted);
        font-size: 11px;
      }
      .plots {
        display: flex;
        flex-wrap: wrap;
        gap: 10px;
        align-items: flex-start;
        margin-top: 8px;
      }
      .plots svg {
        max-width: 100%;
        height: auto;
      }
      .pick {
        margin: 8px 0 0;
        font-size: 13px;
      }
    `,
  ];

  /** The variant whose landings and fall are drawn (null: the site's chosen one). */
  @state() private shown: string | null = null;
  @query('h2') private heading?: HTMLElement;

  private listening?: PlanStore;
  private returnTo: HTMLElement | null = null;
  private focusPending = false;
  private cachePlan: Plan | null = null;
  private cacheDem: Dem | null = null;
  private cache = new Map<string, SiteSamples | string>();

  private readonly onSelect = (e: Event): void => {
    const id = (e as CustomEvent<string | null>).detail;
    if (id !== null) {
      const a = deepActive();
      // Where focus goes back to on close: what had it before the view opened.
      if (a && !this.shadowRoot?.contains(a) && a !== this) this.returnTo = a;
      this.shown = null;
      this.focusPending = true;
    } else {
      this.restoreFocus();
    }
    this.requestUpdate();
  };

  protected willUpdate(changed: PropertyValues<this>): void {
    if (changed.has('store') && this.listening !== this.store) {
      this.listening?.removeEventListener('select-site', this.onSelect);
      this.listening = this.store;
      this.listening?.addEventListener('select-site', this.onSelect);
    }
  }

  connectedCallback(): void {
    super.connectedCallback();
    if (this.store && this.listening !== this.store) {
      this.listening = this.store;
      this.store.addEventListener('select-site', this.onSelect);
    }
  }

  disconnectedCallback(): void {
    super.disconnectedCallback();
    this.listening?.removeEventListener('select-site', this.onSelect);
    this.listening = undefined;
  }

  protected updated(): void {
    if (this.focusPending && this.heading) {
      this.focusPending = false;
      this.heading.focus();
    }
  }

  private close(): void {
    this.store?.selectSite(null);
  }

  private restoreFocus(): void {
    const back = this.returnTo;
    this.returnTo = null;
    if (back?.isConnected) back.focus();
  }

  private onKey(e: KeyboardEvent): void {
    if (e.key === 'Escape') {
      e.preventDefault();
      e.stopPropagation();
      this.close();
    }
  }

  /** The re-flown landings of site × variant for the shown result (cached), or why not. */
  private samples(
    plan: Plan,
    siteId: string,
    variantId: string,
    dem: Dem | null,
  ): SiteSamples | string {
    if (this.cachePlan !== plan || this.cacheDem !== dem) {
      this.cachePlan = plan;
      this.cacheDem = dem;
      this.cache.clear();
    }
    const key = `${siteId}\u0000${variantId}`;
    let got = this.cache.get(key);
    if (got === undefined) {
      try {
        got =
          siteSamples(plan, siteId, variantId, { terrain: dem ?? undefined }) ??
          'this site or variant is not in the plan';
      } catch (e) {
        got = e instanceof Error ? e.message : String(e);
      }
      if (this.cache.size >= CACHE_MAX) this.cache.delete(this.cache.keys().next().value!);
      this.cache.set(key, got);
    }
    return got;
  }

  render() {
    const s = this.store;
    const id = s?.selectedSite ?? null;
    if (!s || id === null) return nothing;
    const r = s.result;
    const site = r?.sites.find((x) => x.id === id);
    const plan = s.resultPlan;
    if (!r || !site || !plan) {
      return html`<section data-testid="site-details" @keydown=${this.onKey}>
        <header>
          <h2 tabindex="-1">Site ${id}</h2>
          <button @click=${() => this.close()} aria-label="Close site details">Close ✕</button>
        </header>
        <p class="muted">No result for this site yet (planning…).</p>
      </section>`;
    }
    const u = s.settings.units;
    const rec = site.recommendation;
    const unreachable = rec.kind === 'unreachable';
    // A pin is the crew's choice; without one, an unreachable site has no chosen variant.
    const chosenId = site.pinned || !unreachable ? site.variant : null;
    let touch: Touchdown[];
    try {
      touch = siteTouchdowns(plan, r, id);
    } catch {
      touch = []; // energy shows "–" rather than the view failing
    }
    const shown = this.shown ?? site.variant;
    const moving = r.track.groundSpeed_mps > 0;
    return html`<section
      data-testid="site-details"
      data-site=${id}
      aria-label=${`Site ${id} details`}
      @keydown=${this.onKey}
    >
      <header>
        <h2 tabindex="-1">Site ${id}${site.name && site.name !== id ? ` — ${site.name}` : ''}</h2>
        <button @click=${() => this.close()} aria-label="Close site details" title="Close (Esc)">
          Close ✕
        </button>
      </header>
      ${unreachable ? html`<p class="alert" role="alert" data-testid="unreachable">No variant can reach this site.</p>` : nothing}
      ${this.whyLine(site)}
      <div class="scroll">${this.comparison(site, chosenId, touch, moving, u)}</div>
      ${this.plots(plan, site, shown, u)} ${this.terrain(site, shown, u)}
    </section>`;
  }

  private whyLine(site: SiteResult) {
    const rec = site.recommendation;
    if (site.pinned) {
      return html`<p class="why" data-testid="why">
        Pinned by the site: <b>${site.variant}</b>.
        ${
          rec.kind === 'unreachable'
            ? html`Without the pin: no variant can reach this site (${rec.why}).`
            : html`Without the pin the rule would recommend <b>${rec.variant}</b>: ${rec.why}.`
        }
      </p>`;
    }
    if (rec.kind === 'unreachable')
      return html`<p class="why" data-testid="why">
        Why: ${rec.why}. The drawings show the variant with the highest P(hit),
        <b>${rec.variant}</b>, for reference only.
      </p>`;
    return html`<p class="why" data-testid="why">
      ${rec.kind === 'meets' ? 'Chosen' : 'Best available'}: <b>${rec.variant}</b> — ${rec.why}.
    </p>`;
  }

  private comparison(
    site: SiteResult,
    chosenId: string | null,
    touch: Touchdown[],
    moving: boolean,
    u: UnitPrefs,
  ) {
    const vs = site.byVariant;
    const cost = new Map(site.comparison.map((c) => [c.variant, c.cost]));
    const cls = (v: VariantResult, extra = ''): string =>
      `${extra} ${v.variant === chosenId ? 'chosen' : ''}`.trim();
    const row = (key: string, label: string, cell: (v: VariantResult) => unknown, k = '') =>
      html`<tr data-row=${key}>
        <th scope="row">${label}</th>
        ${vs.map((v) => html`<td class=${cls(v, k)} data-variant=${v.variant}>${cell(v)}</td>`)}
      </tr>`;
    const energy = (v: VariantResult) => {
      const t = touch.find((x) => x.variant === v.variant);
      if (!t) return '–';
      const speed = formatSpeed(t.speed_mps, u.speed, 1);
      return t.energy_J === null
        ? html`mass unknown <span class="se">(${speed})</span>`
        : html`${num(t.energy_J, 2)} J <span class="se">(${speed})</span>`;
    };
    return html`<table data-testid="variant-comparison">
      <thead>
        <tr>
          <th scope="col">Variant</th>
          ${vs.map(
            (v) =>
              html`<th scope="col" class=${cls(v)} data-variant=${v.variant}>
                ${v.variant}
                ${
                  v.variant === chosenId
                    ? html`<span class="mark" data-testid="chosen-mark"
                        >${site.pinned ? '★ pinned' : '★ chosen'}</span
                      >`
                    : nothing
                }
              </th>`,
          )}
        </tr>
      </thead>
      <tbody>
        ${row(
          'reach',
          'Can reach',
          (v) =>
            html`<span class=${v.reachable ? 'good' : 'bad'}>${v.reachable ? 'yes' : 'no'}</span>`,
        )}
        ${row('phit', 'P(hit)', (v) => {
          const { p, se } = pHitParts(v.pHit, v.pHitSE);
          const ok = v.pHit >= (this.store?.resultPlan?.requiredPHit ?? 0);
          return html`<span class=${ok ? 'good' : 'bad'}>${p}</span
            >${se === null ? nothing : html`<span class="se"> ± ${se}</span>`}`;
        })}
        ${row('cep', 'CEP', (v) => formatQuantity(v.cep_m, 'distance', u))}
        ${
          moving
            ? row('window', 'Release window', (v) => windowText(v))
            : row('zone', 'Hover zone', (v) =>
                v.releaseZone
                  ? `r ${formatQuantity(v.releaseZone.radius_m, 'distance', u)}`
                  : 'none',
              )
        }
        ${row('heading', 'Heading T / M °', (v) =>
          v.headingTrue_deg === undefined
            ? '–'
            : `${num(v.headingTrue_deg, 0)} / ${num(v.headingMag_deg, 0)}`,
        )}
        ${row('thrust', 'Thrust', (v) => (v.thrustTime_s === undefined ? '–' : `${num(v.thrustTime_s)} s`))}
        ${row('energy', 'Impact energy', energy)}
        ${row('cost', 'Cost', (v) => String(cost.get(v.variant) ?? '–'))}
      </tbody>
    </table>`;
  }

  /** Over an elevation model: the site's ground, the shown variant's fall over the ground, hidden ground. */
  private terrain(site: SiteResult, shown: string, u: UnitPrefs) {
    const v = site.byVariant.find((x) => x.variant === shown);
    const t = v?.terrain;
    const g = site.ground;
    if (!t && !g) return nothing;
    const h = (m: number) => formatQuantity(m, 'height', u);
    const unit = { label: u.length, perMetre: toDisplayLength(1, u.length) };
    let source: unknown = nothing;
    if (g) {
      const said = g.terrain_m;
      source =
        g.source === 'terrain'
          ? 'elevation from the terrain model'
          : g.source === 'typed'
            ? said === null
              ? 'typed; the terrain model has no height here'
              : Math.abs(g.elevation_m - said) > 5
                ? `typed; the model says ${h(said)}`
                : 'typed; the terrain model agrees within 5 m'
            : "the plan's ground elevation (neither typed nor in the terrain model)";
    }
    const hid = t?.hiddenBy;
    return html`<div data-testid="site-terrain">
      <h3>Over the terrain</h3>
      ${
        g
          ? html`<p data-testid="site-ground">
              Site elevation ${h(g.elevation_m)} MSL: ${source}.
            </p>`
          : nothing
      }
      ${
        t
          ? html`<p data-testid="landing-ground">
              Ground at the nominal landing of ${shown}:
              ${
                t.landingGround_m === null
                  ? 'unknown — the nominal descent met no ground the model knows'
                  : `${h(t.landingGround_m)} MSL`
              }.${
                t.offTerrain > 0
                  ? ` ${(t.offTerrain * 100).toFixed(1)} % of the landings met no known ground and count as misses.`
                  : ''
              }
            </p>`
          : nothing
      }
      ${
        hid
          ? html`<p class="alert" role="alert" data-testid="hidden-ground">
              Hidden ground: the descent aimed at this site meets ground ${h(hid.aboveSite_m)}
              higher than the site, ${formatQuantity(hid.fromSite_m, 'distance', u)} from it, before
              reaching it (${hid.lat.toFixed(5)}, ${hid.lon.toFixed(5)}; ground ${h(hid.ground_m)}
              MSL).
            </p>`
          : nothing
      }
      ${
        t && v
          ? html`<div class="plots" data-testid="ground-profile">
              ${unsafeSVG(
                groundProfileSvg(t.fallProfile, {
                  title: `${site.id} · ${shown} over the ground`,
                  unit,
                  width_px: 480,
                  height_px: 220,
                  site: g
                    ? { dist_m: distance_m(v.release, site), elevation_m: g.elevation_m }
                    : undefined,
                }),
              )}
            </div>`
          : nothing
      }
    </div>`;
  }

  private plots(plan: Plan, site: SiteResult, shown: string, u: UnitPrefs) {
    // Landings re-flown over the ground the result was planned over (the model in use).
    const dem = this.store?.result?.terrain ? (this.store.dem ?? null) : null;
    const got = this.samples(plan, site.id, shown, dem);
    const unit = { label: u.length, perMetre: toDisplayLength(1, u.length) };
    const title = `${site.id} · ${shown}`;
    return html`<p class="pick">
        <label
          >Landings and fall of
          <select
            data-testid="shown-variant"
            @change=${(e: Event) => (this.shown = (e.target as HTMLSelectElement).value)}
          >
            ${site.byVariant.map(
              (v) =>
                html`<option .value=${v.variant} ?selected=${v.variant === shown}>
                  ${v.variant}${v.variant === site.variant ? ' (as in the table)' : ''}
                </option>`,
            )}
          </select></label
        >
        <span class="muted">Monte Carlo landings as planned (same seed), north up.</span>
      </p>
      ${
        typeof got === 'string'
          ? html`<p class="bad">No landings to draw: ${got}.</p>`
          : html`<div class="plots">
              <div data-testid="scatter">
                ${unsafeSVG(scatterSvg(got, { title, unit, size_px: 300 }))}
              </div>
              <div data-testid="fall-profile">
                ${unsafeSVG(fallProfileSvg(got.profile, { title: shown, unit, width_px: 300, height_px: 220 }))}
              </div>
            </div>`
      }`;
  }
}
