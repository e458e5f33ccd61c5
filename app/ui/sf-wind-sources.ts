import { css, html } from 'lit';
import { customElement, state } from 'lit/decorators.js';
import { sharedStyles } from './shared-styles';
import { StoreElement } from './store-element';
import { AltitudeSweep } from './altitude-sweep';
import { ForecastTimeline } from './forecast-timeline';
import { soundingSection } from './sounding-import';
import { SurfaceReadingForm } from './surface-reading-form';
import { SweepClient } from './sweep-client';
import { WindsAloftBulletin } from './winds-aloft-bulletin';
import type { WindSourcesHost } from './wind-sources-host';

/**
 * Ways to get wind into the plan without retyping: a sounding or profile CSV, a pasted
 * winds-aloft text forecast, a surface reading extended to the ground; and the wind plots.
 * Each section is its own module; this element holds them and the one list of problems.
 */
@customElement('sf-wind-sources')
export class SfWindSources extends StoreElement implements WindSourcesHost {
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

  @state() problems: string[] = [];
  private readonly client = new SweepClient(this);
  private readonly sweep = new AltitudeSweep(this, this.client);
  private readonly forecasts = new ForecastTimeline(this, this.client);
  private readonly bulletin = new WindsAloftBulletin(this);
  private readonly surface = new SurfaceReadingForm(this);

  render() {
    const s = this.store;
    if (!s) return html``;
    return html`
      ${this.sweep.render()} ${this.forecasts.render()} ${soundingSection(this)}
      ${this.bulletin.render()} ${this.surface.render(s.settings.units.speed)}
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
