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

/** The turbulence classes in plain words (wind at 20 ft of the MIL-F-8785C low-altitude classes). */
const TURBULENCE: [string, string][] = [
  ['auto', 'auto (20 ft wind)'],
  ['none', 'none'],
  ['light', 'light'],
  ['moderate', 'moderate'],
  ['severe', 'severe'],
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
      .hint {
        font-size: 12px;
        color: var(--sf-muted);
        margin: 2px 0 4px;
      }
      .sigma {
        text-transform: none;
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
    // Optional overrides: empty removes the key, so the modelled value applies.
    const m = (path: string, label: string, kind: 'speed' | 'plain', unit = '') =>
      numberField(s, path, label, { kind, unit, optional: true, placeholder: 'modelled' });
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
      <h3>Uncertainty (1<span class="sigma">σ</span>)</h3>
      <section>
        ${n('uncertainty.windSpeed_mps', 'Wind, per component', 'speed')}
        ${n('uncertainty.windCorrelation_m', 'Wind error correlation height', 'length')}
        ${n('uncertainty.descentRate_pct', 'Descent rate', 'plain', '%')}
        ${n('uncertainty.releasePosition_m', 'Release position, per axis', 'length')}
        ${n('uncertainty.heading_deg', 'Heading (steered)', 'plain', '°')}
        ${n('uncertainty.releaseTiming_s', 'Release timing', 'plain', 's')}
        <sf-text-field
          .store=${s}
          path="uncertainty.turbulence"
          label="Turbulence (gusts, vertical air)"
          fallback="auto"
          .options=${TURBULENCE}
        ></sf-text-field>
        ${m('uncertainty.gust_mps', 'Gust, per component', 'speed')}
        ${m('uncertainty.gustTime_s', 'Gust correlation time', 'plain', 's')}
        ${m('uncertainty.verticalAir_mps', 'Vertical air', 'speed')}
        <p class="hint">
          Turbulence: auto takes its strength from the plan’s wind at 20 ft above the ground; light,
          moderate and severe are the standard’s classes (as a wind at 20 ft of 15, 30 and 45 kt);
          none models no gusts or vertical air. Leave gust, correlation time and vertical air empty
          for the modelled values; a value set here replaces the modelled one of its kind.
        </p>
      </section>
      <h3>Monte Carlo</h3>
      <section>
        ${n('monteCarlo.samples', 'Samples', 'plain', '')}
        ${n('monteCarlo.seed', 'Seed', 'plain', '')}
      </section>
    `;
  }
}
