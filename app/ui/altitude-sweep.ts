// The wind profile section of <sf-wind-sources>: profile plot, hodograph and altitude sweep.
import { html } from 'lit';
import { unsafeSVG } from 'lit/directives/unsafe-svg.js';
import { hodographSvg, sweepSvg, windPlotSvg } from '../brief';
import { sweepHeightsAGL, type SweepPoint } from '../planner';
import type { SweepClient } from './sweep-client';
import type { WindSourcesHost } from './wind-sources-host';

/**
 * P(hit) and CEP of one site and variant at release altitudes around the planned one, beside the
 * plots of the plan's wind. The plots are our own SVG strings with all text escaped
 * (app/brief/brief-svg.ts).
 */
export class AltitudeSweep {
  private site = '';
  private variant = '';
  private sweep: { key: string; points: SweepPoint[] } | null = null;

  constructor(
    private readonly host: WindSourcesHost,
    private readonly client: SweepClient,
  ) {}

  private readonly run = (): void => {
    const s = this.host.store;
    const plan = s?.plan;
    const r = s?.result;
    if (!s || !plan || !r) return;
    const site = this.site || r.sites[0]?.id;
    const variant =
      this.variant || r.sites.find((x) => x.id === site)?.variant || plan.variants[0]?.id;
    if (!site || !variant) return;
    const altitudes = sweepHeightsAGL(plan, r.releaseAltitudeMSL_m);
    const key = `${site} · ${variant}`;
    this.client.ask(
      {
        id: 0,
        kind: 'altitude',
        plan,
        siteId: site,
        variantId: variant,
        altitudesAGL_m: altitudes,
      },
      (reply) => {
        if ('points' in reply) {
          this.sweep = { key, points: reply.points };
          // The brief prints this plot while the plan stays as it was swept.
          s.sweep = { title: key, points: reply.points, plan };
        }
      },
    );
  };

  private pick(which: 'site' | 'variant') {
    return (e: Event) => {
      this[which] = (e.target as HTMLSelectElement).value;
      this.host.requestUpdate();
    };
  }

  private renderPlots() {
    const s = this.host.store;
    if (!s?.plan || !s.result) return '';
    const r = s.result;
    const site = this.site || r.sites[0]?.id;
    const variant = this.variant || r.sites.find((x) => x.id === site)?.variant;
    const c = this.client;
    return html`<div class="plot" data-testid="wind-plot">${unsafeSVG(windPlotSvg(s.plan, r))}</div>
      <h3>Hodograph</h3>
      <div class="plot" data-testid="hodograph">
        ${unsafeSVG(hodographSvg(s.plan, { releaseAltitudeMSL_m: r.releaseAltitudeMSL_m }))}
      </div>
      <h3>P(hit) and CEP against release altitude</h3>
      <div class="row">
        <label
          >Site
          <select data-testid="sweep-site" @change=${this.pick('site')}>
            ${r.sites.map((x) => html`<option ?selected=${x.id === site}>${x.id}</option>`)}
          </select></label
        >
        <label
          >Variant
          <select data-testid="sweep-variant" @change=${this.pick('variant')}>
            ${s.plan.variants.map((v) => html`<option ?selected=${v.id === variant}>${v.id}</option>`)}
          </select></label
        >
        <button ?disabled=${c.sweeping} @click=${this.run}>
          ${c.sweeping ? 'Computing…' : 'Compute'}
        </button>
        ${c.error ? html`<span class="field-error" role="alert" data-testid="sweep-error">${c.error}</span>` : ''}
      </div>
      ${
        this.sweep
          ? html`<div class="plot" data-testid="sweep">
              ${unsafeSVG(
                sweepSvg(this.sweep.points, {
                  requiredPHit: s.plan.requiredPHit,
                  title: this.sweep.key,
                }),
              )}
            </div>`
          : ''
      }`;
  }

  render() {
    return html`<section>
      <h3>Wind profile</h3>
      ${this.renderPlots()}
    </section>`;
  }
}
