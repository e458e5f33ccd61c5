// The forecast section of <sf-wind-sources>: stored forecast times and the release-time timeline.
import { html } from 'lit';
import { unsafeSVG } from 'lit/directives/unsafe-svg.js';
import {
  noWindowText,
  planZone,
  timelineSvg,
  timelineWindows,
  windowsNote,
  zoneClockText,
} from '../brief';
import type { Plan } from '../plan';
import { planForecastSeries, TIMELINE_STEP_S, type TimelineEntry } from '../planner';
import type { WindLayer } from '../model';
import { schemaMaxItems } from '../formats';
import { deleteRowButton } from './delete-row-button';
import type { SweepClient } from './sweep-client';
import type { WindSourcesHost } from './wind-sources-host';

/** The time typed for the next forecast; renders its section and the store's last timeline. */
export class ForecastTimeline {
  private forecastTime = '';

  constructor(
    private readonly host: WindSourcesHost,
    private readonly client: SweepClient,
  ) {}

  /** P(hit) per site over the forecast span (the plan's winds at the plan time plus forecasts). */
  private readonly run = (): void => {
    const plan = this.host.store?.plan;
    if (!plan) return;
    this.client.ask({ id: 0, kind: 'timeline', plan, step_s: TIMELINE_STEP_S }, (reply) => {
      const s = this.host.store;
      // Kept on the store with its plan: the brief prints it while the plan is unchanged.
      if ('timeline' in reply && s) s.timeline = { entries: reply.timeline, plan };
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
      ${s.timeline ? this.timelineView(s.timeline.entries, s.timeline.plan, s.plan) : ''}
    </section>`;
  }

  /** The drawing (site ids escaped by timelineSvg) and each site's window clock times. */
  private timelineView(entries: TimelineEntry[], plan: Plan, current: Plan | null) {
    const zone = planZone(plan.time);
    const w = timelineWindows(entries, plan.requiredPHit, zone);
    // pHitTimeline stops after TIMELINE_MAX_STEPS times: say so when the span reaches further.
    const spanEnd = planForecastSeries(plan).span.end_ms;
    const cut = entries.length > 0 && Date.parse(w.end) + TIMELINE_STEP_S * 1000 <= spanEnd;
    return html`${
        current !== plan
          ? html`<p class="muted" data-testid="timeline-stale">
              Computed for an earlier version of the plan: press Timeline again.
            </p>`
          : ''
      }
      <div class="plot" data-testid="timeline">
        ${unsafeSVG(timelineSvg(entries, plan.requiredPHit, { zone }))}
      </div>
      ${
        cut
          ? html`<p class="field-error">
              The timeline stops at ${zoneClockText(Date.parse(w.end), zone, true)}, before the last
              forecast time: at most ${entries.length} times are evaluated.
            </p>`
          : ''
      }
      <h4>Release windows by clock time</h4>
      <table data-testid="timeline-windows">
        <thead>
          <tr>
            <th>Site</th>
            <th>Opens</th>
            <th>Closes</th>
            <th>Variant</th>
            <th>Note</th>
          </tr>
        </thead>
        <tbody>
          ${w.sites.map((site) =>
            site.windows.length === 0
              ? html`<tr data-site=${site.id}>
                  <td>${site.id}</td>
                  <td colspan="4" class="muted">${noWindowText(plan.requiredPHit)}</td>
                </tr>`
              : site.windows.map(
                  (x, i) =>
                    html`<tr data-site=${site.id}>
                      <td>${i === 0 ? site.id : ''}</td>
                      <td>${x.openText}</td>
                      <td>${x.closeText}</td>
                      <td>${x.variants.join(', ')}</td>
                      <td>
                        ${[
                          x.atStart ? 'from the first time' : '',
                          x.atEnd ? 'to the last time' : '',
                        ]
                          .filter(Boolean)
                          .join('; ')}
                      </td>
                    </tr>`,
                ),
          )}
        </tbody>
      </table>
      <p class="muted">${windowsNote(w, plan.requiredPHit)}</p>`;
  }
}
