import { css, html } from 'lit';
import { customElement } from 'lit/decorators.js';
import { sharedStyles } from './shared-styles';
import { StoreElement } from './store-element';
import './sf-coord-field';
import { numberField, type FieldKind } from './sf-number-field';
import './sf-text-field';
import './terrain-section';

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
    const n = (path: string, label: string, kind: FieldKind, optional = true, unit = '') =>
      numberField(s, path, label, { kind, unit, optional });
    // Optional overrides: empty removes the key, so the modelled value applies.
    const m = (path: string, label: string, kind: FieldKind) =>
      numberField(s, path, label, { kind, optional: true, placeholder: 'modelled' });
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
        ${n('requiredPHit', 'Required P(hit), 0 to 1', 'probability')}
      </section>
      <h3>Release point</h3>
      <section>
        ${n('release.lat', 'Latitude', 'coordinate', false)}
        ${n('release.lon', 'Longitude', 'coordinate', false)}
        <sf-coord-field .store=${s} path="release" label="Position (any format)"></sf-coord-field>
        ${n('release.altitude_m', 'Release altitude', 'height', false)}
        <sf-text-field
          .store=${s}
          path="release.reference"
          label="Altitude reference"
          .options=${REF}
        ></sf-text-field>
        ${n('groundElevation_m', 'Ground elevation of the area (MSL)', 'height')}
      </section>
      <h3>Terrain</h3>
      <sf-terrain-section .store=${s}></sf-terrain-section>
      <h3>Carrier</h3>
      <section>
        ${n('carrier.groundSpeed_mps', 'Ground speed (0 = hover)', 'speed')}
        ${n('carrier.trackDeg', 'Track over the ground', 'bearing', true, '° true')}
      </section>
      <h3>Atmosphere</h3>
      <section>
        ${n('atmosphere.isaOffset_K', 'Temperature offset from ISA', 'temperature')}
        ${n('winds.surfaceExponent', 'Wind exponent α below the lowest layer', 'ratio')}
      </section>
      <h3>Uncertainty (1σ)</h3>
      <section>
        ${n('uncertainty.windSpeed_mps', 'Wind forecast error, per component', 'speed')}
        ${n('uncertainty.windCorrelation_m', 'Height over which wind errors decorrelate', 'height')}
        ${n('uncertainty.descentRate_pct', 'Descent rate error', 'percent')}
        ${n('uncertainty.releasePosition_m', 'Release position error, per axis', 'distance')}
        ${n('uncertainty.heading_deg', 'Heading error (steered variants)', 'angle')}
        ${n('uncertainty.releaseTiming_s', 'Release timing error', 'time')}
        <sf-text-field
          .store=${s}
          path="uncertainty.turbulence"
          label="Turbulence (gusts, vertical air)"
          fallback="auto"
          .options=${TURBULENCE}
        ></sf-text-field>
        ${m('uncertainty.gust_mps', 'Gust, per component', 'speed')}
        ${m('uncertainty.gustTime_s', 'Gust correlation time', 'time')}
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
        ${n('monteCarlo.samples', 'Samples', 'count')}
        ${n('monteCarlo.seed', 'Random seed', 'count')}
      </section>
    `;
  }
}
