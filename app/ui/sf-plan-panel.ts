import { css, html } from 'lit';
import { customElement } from 'lit/decorators.js';
import { sharedStyles } from './shared-styles';
import { StoreElement } from './store-element';
import './sf-coord-field';
import { numberField } from './sf-number-field';
import './sf-text-field';

const REF: [string, string][] = [
  ['AGL', 'above plan ground (AGL)'],
  ['MSL', 'above sea level (MSL)'],
];

/** Release, carrier, atmosphere, uncertainty and Monte Carlo settings of the plan. */
@customElement('sf-plan-panel')
export class SfPlanPanel extends StoreElement {
  static styles = [
    sharedStyles,
    css`
      :host {
        display: block;
      }
      section {
        display: grid;
        gap: 2px;
      }
      .coord {
        font-size: 12px;
        color: var(--sf-muted);
        text-align: right;
      }
    `,
  ];

  render() {
    const s = this.store;
    if (!s) return html``;
    const n = (
      path: string,
      label: string,
      kind: 'length' | 'speed' | 'plain' = 'plain',
      unit = '',
      optional = true,
    ) => numberField(s, path, label, { kind, unit, optional });
    return html`
      <h3>Plan</h3>
      <section>
        <sf-text-field .store=${s} path="name" label="Plan name" optional></sf-text-field>
        <sf-text-field
          .store=${s}
          path="time"
          label="Release time (ISO 8601, with zone)"
          placeholder="2026-12-01T09:30:00Z"
        ></sf-text-field>
        ${n('requiredPHit', 'Required P(hit), 0–1', 'plain', '')}
      </section>
      <h3>Release point</h3>
      <section>
        ${n('release.lat', 'Latitude', 'plain', '°', false)}
        ${n('release.lon', 'Longitude', 'plain', '°', false)}
        <sf-coord-field .store=${s} path="release" label="Position (any format)"></sf-coord-field>
        ${n('release.altitude_m', 'Release altitude', 'length', '', false)}
        <sf-text-field
          .store=${s}
          path="release.reference"
          label="Altitude measured"
          .options=${REF}
        ></sf-text-field>
        ${n('groundElevation_m', 'Plan ground elevation (MSL)', 'length')}
      </section>
      <h3>Carrier</h3>
      <section>
        ${n('carrier.groundSpeed_mps', 'Ground speed (0 = hover)', 'speed')}
        ${n('carrier.trackDeg', 'Track', 'plain', '° true')}
      </section>
      <h3>Atmosphere</h3>
      <section>
        ${n('atmosphere.isaOffset_K', 'Temperature offset from ISA', 'plain', 'K')}
        ${n('winds.surfaceExponent', 'Near-ground wind exponent α', 'plain', '')}
      </section>
      <h3>Uncertainty (1σ)</h3>
      <section>
        ${n('uncertainty.windSpeed_mps', 'Wind, per component', 'speed')}
        ${n('uncertainty.windCorrelation_m', 'Wind error correlation height', 'length')}
        ${n('uncertainty.descentRate_pct', 'Descent rate', 'plain', '%')}
        ${n('uncertainty.releasePosition_m', 'Release position, per axis', 'length')}
        ${n('uncertainty.heading_deg', 'Heading (steered)', 'plain', '°')}
        ${n('uncertainty.releaseTiming_s', 'Release timing', 'plain', 's')}
      </section>
      <h3>Monte Carlo</h3>
      <section>
        ${n('monteCarlo.samples', 'Samples', 'plain', '')}
        ${n('monteCarlo.seed', 'Seed', 'plain', '')}
      </section>
    `;
  }
}
