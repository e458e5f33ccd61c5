// The forecast section of <sf-wind-sources>: stored forecast times and the release-time timeline.
import { html } from 'lit';
import { unsafeSVG } from 'lit/directives/unsafe-svg.js';
import { timelineSvg } from '../brief';
import type { TimelineEntry } from '../planner';
import type { WindLayer } from '../model';
import { schemaMaxItems } from '../formats';
import { deleteRowButton } from './delete-row-button';
import type { SweepClient } from './sweep-client';
import type { WindSourcesHost } from './wind-sources-host';

/** The time typed for the next forecast and the last timeline computed; renders its section. */
export class ForecastTimeline {
  private forecastTime = '';
  private timeline: TimelineEntry[] | null = null;

  constructor(
    private readonly host: WindSourcesHost,
    private readonly client: SweepClient,
  ) {}

  /** P(hit) per site over the forecast span (the plan's winds at the plan time plus forecasts). */
  private readonly run = (): void => {
    const plan = this.host.store?.plan;
    if (!plan) return;
    this.client.ask({ id: 0, kind: 'timeline', plan, step_s: 900 }, (reply) => {
      if ('timeline' in reply) this.timeline = reply.timeline;
    });
  };

  /** Stores the current layers as a forecast valid at the time typed (ISO 8601). */
  private readonly addForecast = (): void => {
    const s = this.host.store;
    if (!s) return;
    const time = this.forecastTime.trim();
    if (!Number.isFinite(Date.parse(time)) || !/T\d\d:\d\d/.test(time)) {
      this.host.problems = [
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
      this.host.problems = [
        `the plan holds at most ${max} forecasts; delete one before storing another`,
      ];
      return;
    }
    this.host.problems = [];
    s.edit(
      'winds.forecasts',
      [...list, { time, reference: String(s.get('winds.reference') ?? 'AGL'), layers }].sort(
        (a, b) => Date.parse(String(a.time)) - Date.parse(String(b.time)),
      ),
    );
  };

  render() {
    const s = this.host.store;
    if (!s) return '';
    const c = this.client;
    return html`<section>
      <h3>Forecast times and release-time timeline</h3>
      <p class="muted">
        The layers above hold at the plan time. Store them as a forecast valid at another time, then
        load the next forecast hour into the table and store it too; the timeline shows, per site,
        the clock times at which a release meets the required P(hit).
      </p>
      <ul>
        ${s
          .rows<{ time: string; layers: unknown[] }>('winds.forecasts')
          .map(
            (f, i) =>
              html`<li data-forecast=${i}>
                ${String(f.time ?? '')} · ${Array.isArray(f.layers) ? f.layers.length : 0} layer(s)
                ${deleteRowButton(s, 'winds.forecasts', i, `Delete forecast ${f.time}`)}
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
            @input=${(e: Event) => {
              this.forecastTime = (e.target as HTMLInputElement).value;
              this.host.requestUpdate();
            }}
        /></label>
        <button @click=${this.addForecast}>Store current layers as forecast</button>
        <button ?disabled=${c.sweeping} @click=${this.run}>Timeline</button>
        ${c.error ? html`<span class="field-error" role="alert">${c.error}</span>` : ''}
      </div>
      ${
        this.timeline && s.plan
          ? html`<div class="plot" data-testid="timeline">
              ${unsafeSVG(timelineSvg(this.timeline, s.plan.requiredPHit))}
            </div>`
          : ''
      }
    </section>`;
  }
}
