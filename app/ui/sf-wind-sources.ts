import { LitElement, css, html } from 'lit';
import { customElement, property, state } from 'lit/decorators.js';
import { unsafeSVG } from 'lit/directives/unsafe-svg.js';
import { hodographSvg, sweepSvg, timelineSvg, windPlotSvg } from '../brief';
import { sweepHeightsAGL, type SweepPoint, type TimelineEntry } from '../planner';
import type { SweepReply, SweepRequest } from '../worker';
import { TERRAIN, type TerrainClass, type WindLayer } from '../model';
import {
  blendSurfaceReading,
  decodeWindsAloft,
  rangeProblem,
  schemaMaxItems,
  stationLayers,
  type WindsAloft,
} from '../formats';
import { fromDisplaySpeed, parseNumber } from './units';
import { importSoundingFile, tooLarge } from './import-file';
import type { PlanStore } from './plan-store';
import { sharedStyles } from './shared-styles';
import { StoreController } from './store-controller';

/**
 * Ways to get wind into the plan without retyping: a sounding or profile CSV, a pasted
 * winds-aloft text forecast, a surface reading extended to the ground; and the wind plots.
 * The plots are our own SVG strings with all text escaped (app/brief/brief-svg.ts).
 */
@customElement('sf-wind-sources')
export class SfWindSources extends LitElement {
  static styles = [
    sharedStyles,
    css`
      :host {
        display: block;
      }
      textarea {
        width: 100%;
        min-height: 7em;
        font:
          12px/1.3 'DejaVu Sans Mono',
          monospace;
      }
      .row {
        display: flex;
        gap: 6px;
        flex-wrap: wrap;
        align-items: center;
        margin: 6px 0;
      }
      .row input {
        width: 6em;
      }
      .problems li {
        color: var(--sf-bad);
      }
      .plot svg {
        max-width: 100%;
        height: auto;
      }
      section {
        border-top: 1px solid var(--sf-line);
        margin-top: 10px;
      }
    `,
  ];

  @property({ attribute: false }) store?: PlanStore;
  @state() private bulletin = '';
  @state() private decoded: WindsAloft | null = null;
  @state() private station = '';
  @state() private problems: string[] = [];
  @state() private reading = { height: '2', speed: '', from: '' };
  @state() private terrain: TerrainClass = 'open';
  @state() private law: 'log' | 'power' = 'log';
  @state() private sweepSite = '';
  @state() private sweepVariant = '';
  @state() private sweep: { key: string; points: SweepPoint[] } | null = null;
  @state() private sweeping = false;
  /** Why the last sweep or timeline could not run (shown beside its button). */
  @state() private sweepError = '';
  @state() private timeline: TimelineEntry[] | null = null;
  @state() private forecastTime = '';
  private sweepWorker?: Worker;
  private sweepId = 0;

  constructor() {
    super();
    new StoreController(this, () => this.store);
  }

  /**
   * Puts layers (and optionally temperatures) into the plan as one undo step. The notice says
   * "in use" only for what went in, and counts what the import left out (`notUsed`).
   */
  private useLayers(
    reference: 'AGL' | 'MSL',
    layers: WindLayer[],
    temperatures: { altitude_m: number; temperature_K: number }[],
    what: string,
    notUsed = 0,
  ): void {
    const s = this.store!;
    const winds = s.obj('winds');
    const atmosphere = s.obj('atmosphere');
    const next = structuredClone(s.draft);
    next.winds = { ...winds, reference, layers };
    if (temperatures.length) {
      next.atmosphere = { ...atmosphere, sounding: { reference, levels: temperatures } };
    }
    const keptSounding = !temperatures.length && (atmosphere as { sounding?: unknown }).sounding;
    s.replace(next);
    s.setNotice(
      notUsed > 0 ? 'error' : 'info',
      `${what}: ${layers.length} wind layer(s)${temperatures.length ? ` and ${temperatures.length} temperature(s)` : ''} in use.` +
        (notUsed > 0
          ? ` ${notUsed} value(s) were not used: outside the plan's ranges or over its limits (listed under Problems).`
          : '') +
        (keptSounding
          ? ' The earlier sounding’s temperatures still set the air density (remove them with “Use the ISA offset instead”).'
          : ''),
    );
  }

  private async onSounding(e: Event): Promise<void> {
    const input = e.target as HTMLInputElement;
    const file = input.files?.[0];
    input.value = '';
    if (!file) return;
    const big = tooLarge(file);
    if (big) {
      this.problems = [`${file.name}: ${big}`];
      this.store?.setNotice('error', `${file.name}: ${big}; the plan is unchanged.`);
      return;
    }
    let r;
    try {
      r = await importSoundingFile(file);
    } catch (err) {
      const why = err instanceof Error ? err.message : String(err);
      this.problems = [`${file.name}: the file could not be read: ${why}`];
      this.store?.setNotice(
        'error',
        `${file.name}: the file could not be read (${why}); the plan is unchanged.`,
      );
      return;
    }
    this.problems = r.problems.map((p) => (p.line ? `line ${p.line}: ${p.message}` : p.message));
    if (r.layers.length === 0) {
      this.store?.setNotice('error', `${file.name}: no usable wind rows; the plan is unchanged.`);
      return;
    }
    const ref =
      r.reference ?? (String(this.store?.get('winds.reference') ?? 'AGL') as 'AGL' | 'MSL');
    this.useLayers(ref, r.layers, r.temperatures, file.name, r.notUsed);
  }

  private decode(): void {
    this.decoded = decodeWindsAloft(this.bulletin);
    this.problems = [
      ...this.decoded.problems,
      ...this.decoded.stations.flatMap((s) => s.problems.map((p) => `${s.id}: ${p}`)),
    ];
    this.station = this.decoded.stations[0]?.id ?? '';
  }

  private useStation(): void {
    if (!this.decoded || !this.station) return;
    const r = stationLayers(this.decoded, this.station, {
      groundElevation_m: Number(this.store?.get('groundElevation_m')) || 0,
      reference: 'MSL',
    });
    this.problems = r.problems;
    if (r.layers.length === 0) {
      this.store?.setNotice('error', `Station ${this.station}: no layers above the ground.`);
      return;
    }
    this.useLayers('MSL', r.layers, r.temperatures, `Winds aloft ${this.station}`, r.notUsed);
  }

  private blendSurface(): void {
    const s = this.store!;
    const h = parseNumber(this.reading.height);
    const v = parseNumber(this.reading.speed);
    const d = parseNumber(this.reading.from);
    const bad: string[] = [];
    if (!h.ok || h.value <= 0 || h.value > 100)
      bad.push('reading height must be a number between 0 and 100 m');
    const speed = v.ok ? fromDisplaySpeed(v.value, s.settings.units.speed) : NaN;
    // Speed and direction become plan wind layers: the plan schema's ranges apply.
    if (!v.ok) bad.push('reading speed must be a number');
    else {
      const p = rangeProblem('winds.layers[].speed_mps', speed);
      if (p) bad.push(`reading ${p}`);
    }
    if (!d.ok) bad.push('reading direction must be a number');
    else {
      const p = rangeProblem('winds.layers[].fromDeg', d.value);
      if (p) bad.push(`reading ${p}`);
    }
    if (bad.length || !h.ok || !v.ok || !d.ok) {
      this.problems = bad;
      return;
    }
    const layers = s.list<WindLayer>('winds.layers').slice();
    const ref = String(s.get('winds.reference') ?? 'AGL');
    const ground = Number(s.get('groundElevation_m')) || 0;
    // The surface profile is above ground; compare in the plan's reference.
    const agl = layers.map((l) => ({
      ...l,
      altitude_m: ref === 'MSL' ? l.altitude_m - ground : l.altitude_m,
    }));
    const lowest = agl.length ? Math.min(...agl.map((l) => l.altitude_m)) : 100;
    const r = blendSurfaceReading(
      agl,
      { height_m: h.value, speed_mps: speed, fromDeg: d.value },
      { law: this.law, terrain: this.terrain, upTo_m: Math.max(lowest, h.value + 1) },
    );
    this.problems = r.problems;
    if (!r.added) {
      s.setNotice('error', `Surface reading not used: ${r.problems[0] ?? 'no layers'}.`);
      return;
    }
    const merged = r.layers.map((l) => ({
      ...l,
      altitude_m: ref === 'MSL' ? l.altitude_m + ground : l.altitude_m,
    }));
    s.edit('winds.layers', merged);
    s.setNotice(
      'info',
      `Surface reading extended to ${Math.round(lowest)} m with the ${this.law} law over ${TERRAIN[this.terrain].label}` +
        (r.problems.length ? `; ${r.problems.join('; ')}.` : '.'),
    );
  }

  disconnectedCallback(): void {
    this.sweepWorker?.terminate();
    this.sweepWorker = undefined;
    super.disconnectedCallback();
  }

  /** P(hit) and CEP of one site and variant at release altitudes around the planned one. */
  private runSweep(): void {
    const s = this.store!;
    const plan = s.plan;
    const r = s.result;
    if (!plan || !r) return;
    const site = this.sweepSite || r.sites[0]?.id;
    const variant =
      this.sweepVariant || r.sites.find((x) => x.id === site)?.variant || plan.variants[0]?.id;
    if (!site || !variant) return;
    const altitudes = sweepHeightsAGL(plan, r.releaseAltitudeMSL_m);
    const key = `${site} · ${variant}`;
    this.ask(
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
  }

  /** Sends one request to the sweep worker; only the latest request's answer is kept. */
  private ask(req: SweepRequest, done: (reply: SweepReply) => void): void {
    // A worker that cannot start or stops says so, and the next request starts a new one.
    const failed = (why: string): void => {
      this.sweepWorker?.terminate();
      this.sweepWorker = undefined;
      this.sweeping = false;
      this.sweepError = `The computation could not run: ${why}. Try again, or reload the page.`;
    };
    try {
      this.sweepWorker ??= new Worker(new URL('../worker/sweep-worker.ts', import.meta.url), {
        type: 'module',
      });
    } catch (e) {
      failed(`its worker could not start (${e instanceof Error ? e.message : String(e)})`);
      return;
    }
    const id = ++this.sweepId;
    this.sweeping = true;
    this.sweepError = '';
    this.sweepWorker.onmessage = (ev: MessageEvent<SweepReply>) => {
      if (ev.data.id !== this.sweepId) return;
      this.sweeping = false;
      if ('error' in ev.data) this.problems = [ev.data.error];
      else done(ev.data);
    };
    this.sweepWorker.onerror = (ev: ErrorEvent) => {
      ev.preventDefault();
      failed(ev.message || 'its worker could not start (its script did not load)');
    };
    this.sweepWorker.onmessageerror = () => failed('its answer could not be read');
    this.sweepWorker.postMessage({ ...req, id });
  }

  /** P(hit) per site over the forecast span (the plan's winds at the plan time plus forecasts). */
  private runTimeline(): void {
    const plan = this.store?.plan;
    if (!plan) return;
    this.ask({ id: 0, kind: 'timeline', plan, step_s: 900 }, (reply) => {
      if ('timeline' in reply) this.timeline = reply.timeline;
    });
  }

  /** Stores the current layers as a forecast valid at the time typed (ISO 8601). */
  private addForecast(): void {
    const s = this.store!;
    const time = this.forecastTime.trim();
    if (!Number.isFinite(Date.parse(time)) || !/T\d\d:\d\d/.test(time)) {
      this.problems = [
        `forecast time "${time}" must be an ISO 8601 date and time, e.g. 2026-12-01T12:00:00Z`,
      ];
      return;
    }
    const layers = structuredClone(s.list<WindLayer>('winds.layers'));
    const list = s
      .rows<{ time: string; layers: WindLayer[] }>('winds.forecasts')
      .filter((f) => f.time !== time);
    const max = schemaMaxItems('winds.forecasts');
    if (list.length >= max) {
      this.problems = [
        `the plan holds at most ${max} forecasts; delete one before storing another`,
      ];
      return;
    }
    this.problems = [];
    s.edit(
      'winds.forecasts',
      [...list, { time, reference: String(s.get('winds.reference') ?? 'AGL'), layers }].sort(
        (a, b) => Date.parse(String(a.time)) - Date.parse(String(b.time)),
      ),
    );
  }

  private renderPlots() {
    const s = this.store!;
    if (!s.plan || !s.result) return '';
    const r = s.result;
    const site = this.sweepSite || r.sites[0]?.id;
    const variant = this.sweepVariant || r.sites.find((x) => x.id === site)?.variant;
    return html`<div class="plot" data-testid="wind-plot">${unsafeSVG(windPlotSvg(s.plan, r))}</div>
      <h3>Hodograph</h3>
      <div class="plot" data-testid="hodograph">
        ${unsafeSVG(hodographSvg(s.plan, { releaseAltitudeMSL_m: r.releaseAltitudeMSL_m }))}
      </div>
      <h3>P(hit) and CEP against release altitude</h3>
      <div class="row">
        <label
          >Site
          <select
            data-testid="sweep-site"
            @change=${(e: Event) => (this.sweepSite = (e.target as HTMLSelectElement).value)}
          >
            ${r.sites.map((x) => html`<option ?selected=${x.id === site}>${x.id}</option>`)}
          </select></label
        >
        <label
          >Variant
          <select
            data-testid="sweep-variant"
            @change=${(e: Event) => (this.sweepVariant = (e.target as HTMLSelectElement).value)}
          >
            ${s.plan.variants.map((v) => html`<option ?selected=${v.id === variant}>${v.id}</option>`)}
          </select></label
        >
        <button ?disabled=${this.sweeping} @click=${this.runSweep}>
          ${this.sweeping ? 'Computing…' : 'Compute'}
        </button>
        ${this.sweepError ? html`<span class="field-error" role="alert" data-testid="sweep-error">${this.sweepError}</span>` : ''}
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
    const s = this.store;
    if (!s) return html``;
    const sounding = s.get('atmosphere.sounding') as { levels?: unknown[] } | undefined;
    return html`
      <section>
        <h3>Wind profile</h3>
        ${this.renderPlots()}
      </section>
      <section>
        <h3>Forecast times and release-time timeline</h3>
        <p class="muted">
          The layers above hold at the plan time. Store them as a forecast valid at another time,
          then load the next forecast hour into the table and store it too; the timeline shows, per
          site, the clock times at which a release meets the required P(hit).
        </p>
        <ul>
          ${s.rows<{ time: string; layers: unknown[] }>('winds.forecasts').map(
            (f, i) =>
              html`<li data-forecast=${i}>
                ${String(f.time ?? '')} · ${Array.isArray(f.layers) ? f.layers.length : 0} layer(s)
                <button
                  aria-label=${`Delete forecast ${f.time}`}
                  @click=${() =>
                    s.edit(
                      'winds.forecasts',
                      s.list('winds.forecasts').filter((_, j) => j !== i),
                    )}
                >
                  ✕
                </button>
              </li>`,
          )}
        </ul>
        <div class="row">
          <label
            >Valid at
            <input
              data-testid="forecast-time"
              style="width:15em"
              placeholder="2026-12-01T12:00:00Z"
              .value=${this.forecastTime}
              @input=${(e: Event) => (this.forecastTime = (e.target as HTMLInputElement).value)}
          /></label>
          <button @click=${this.addForecast}>Store current layers as forecast</button>
          <button ?disabled=${this.sweeping} @click=${this.runTimeline}>Timeline</button>
          ${this.sweepError ? html`<span class="field-error" role="alert">${this.sweepError}</span>` : ''}
        </div>
        ${
          this.timeline && s.plan
            ? html`<div class="plot" data-testid="timeline">
                ${unsafeSVG(timelineSvg(this.timeline, s.plan.requiredPHit))}
              </div>`
            : ''
        }
      </section>
      <section>
        <h3>Sounding or profile file (CSV)</h3>
        <p class="muted">
          Columns altitude, direction, speed, and optionally temperature and pressure; units are
          read from the header (m/ft, m/s/kt/km/h, °C/K, hPa). Bad rows are listed and skipped.
        </p>
        <input
          type="file"
          accept=".csv,.txt"
          data-testid="sounding-file"
          @change=${this.onSounding}
        />
        ${
          sounding?.levels?.length
            ? html`<div class="row">
                <span>Density from the sounding’s ${sounding.levels.length} temperature(s).</span>
                <button @click=${() => s.edit('atmosphere.sounding', undefined)}>
                  Use the ISA offset instead
                </button>
              </div>`
            : ''
        }
      </section>
      <section>
        <h3>Winds-aloft text forecast</h3>
        <textarea
          data-testid="bulletin"
          aria-label="Winds-aloft bulletin text"
          placeholder="Paste the bulletin: the FT level line and the station lines"
          .value=${this.bulletin}
          @input=${(e: Event) => (this.bulletin = (e.target as HTMLTextAreaElement).value)}
        ></textarea>
        <div class="row">
          <button @click=${this.decode}>Decode</button>
          ${
            this.decoded?.stations.length
              ? html`<label
                    >Station
                    <select
                      data-testid="station"
                      @change=${(e: Event) => (this.station = (e.target as HTMLSelectElement).value)}
                    >
                      ${this.decoded.stations.map((st) => html`<option ?selected=${st.id === this.station}>${st.id}</option>`)}
                    </select></label
                  >
                  <button @click=${this.useStation}>Use this station’s winds</button>`
              : ''
          }
        </div>
      </section>
      <section>
        <h3>Surface reading</h3>
        <div class="row">
          <label
            >Height m
            <input
              aria-label="Reading height, m"
              .value=${this.reading.height}
              @input=${(e: Event) => (this.reading = { ...this.reading, height: (e.target as HTMLInputElement).value })}
          /></label>
          <label
            >Speed ${s.settings.units.speed}
            <input
              aria-label="Reading speed"
              .value=${this.reading.speed}
              @input=${(e: Event) => (this.reading = { ...this.reading, speed: (e.target as HTMLInputElement).value })}
          /></label>
          <label
            >From °
            <input
              aria-label="Reading direction from"
              .value=${this.reading.from}
              @input=${(e: Event) => (this.reading = { ...this.reading, from: (e.target as HTMLInputElement).value })}
          /></label>
        </div>
        <div class="row">
          <label
            >Terrain
            <select
              @change=${(e: Event) => (this.terrain = (e.target as HTMLSelectElement).value as TerrainClass)}
            >
              ${(Object.keys(TERRAIN) as TerrainClass[]).map(
                (k) =>
                  html`<option value=${k} ?selected=${k === this.terrain}>
                    ${TERRAIN[k].label} (z0 ${TERRAIN[k].z0_m} m, α ${TERRAIN[k].alpha.toFixed(2)})
                  </option>`,
              )}
            </select></label
          >
          <label
            >Law
            <select
              @change=${(e: Event) => (this.law = (e.target as HTMLSelectElement).value as 'log' | 'power')}
            >
              <option value="log" ?selected=${this.law === 'log'}>logarithmic</option>
              <option value="power" ?selected=${this.law === 'power'}>power</option>
            </select></label
          >
          <button @click=${this.blendSurface}>Extend to the lowest layer</button>
        </div>
      </section>
      ${
        this.problems.length
          ? html`<div class="problems" role="alert">
              <h3>Problems (${this.problems.length})</h3>
              <ul>
                ${this.problems.map((p) => html`<li>${p}</li>`)}
              </ul>
            </div>`
          : ''
      }
    `;
  }
}
