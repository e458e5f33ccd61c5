import { css, html } from 'lit';
import { customElement } from 'lit/decorators.js';
import type { WindLayer } from '../model';
import { sharedStyles } from './shared-styles';
import { StoreElement } from './store-element';
import { numberField } from './sf-number-field';
import './sf-text-field';

/** The wind layers of the plan: altitude, from-direction (° true) and speed, editable in place. */
@customElement('sf-wind-panel')
export class SfWindPanel extends StoreElement {
  static styles = [
    sharedStyles,
    css`
      :host {
        display: block;
      }
      td.act {
        width: 1%;
      }
      .row-actions {
        margin-top: 6px;
        display: flex;
        gap: 6px;
      }
    `,
  ];

  private layers(): WindLayer[] {
    return this.store?.list<WindLayer>('winds.layers') ?? [];
  }

  private add(): void {
    const l = this.layers();
    const last = this.store?.rows<WindLayer>('winds.layers')[l.length - 1];
    const next: WindLayer = last
      ? {
          altitude_m: (Number(last.altitude_m) || 0) + 100,
          fromDeg: Number(last.fromDeg) || 0,
          speed_mps: Number(last.speed_mps) || 0,
        }
      : { altitude_m: 10, fromDeg: 270, speed_mps: 3 };
    this.store?.edit('winds.layers', [...l, next]);
  }

  private removeAt(i: number): void {
    this.store?.edit(
      'winds.layers',
      this.layers().filter((_, j) => j !== i),
    );
  }

  render() {
    const s = this.store;
    if (!s) return html``;
    const layers = this.layers();
    const u = s.settings.units;
    // A layer's messages on a row of their own below it, across the table.
    const messages = (i: number) => {
      const keys = ['altitude_m', 'fromDeg', 'speed_mps'];
      const msgs = keys.map((k) => s.messageAt(`winds.layers[${i}].${k}`)).filter((m) => m);
      return msgs.length
        ? html`<tr class="msg">
            <td colspan="4" role="alert">
              ${msgs.map((m) => html`<div class="field-error">${m}</div>`)}
            </td>
          </tr>`
        : '';
    };
    return html`
      <h3>Winds aloft</h3>
      <sf-text-field
        .store=${s}
        path="winds.reference"
        label="Layer altitude reference"
        .options=${[
          ['AGL', 'above plan ground (AGL)'],
          ['MSL', 'above sea level (MSL)'],
        ]}
      ></sf-text-field>
      <table>
        <thead>
          <tr>
            <th>Altitude (${u.length})</th>
            <th>From (° true)</th>
            <th>Speed (${u.speed})</th>
            <th></th>
          </tr>
        </thead>
        <tbody>
          ${layers.map(
            (_, i) =>
              html`<tr data-layer=${i}>
                  <td>
                    ${numberField(s, `winds.layers[${i}].altitude_m`, `Layer ${i + 1} altitude`, {
                      kind: 'height',
                      compact: true,
                    })}
                  </td>
                  <td>
                    ${numberField(
                      s,
                      `winds.layers[${i}].fromDeg`,
                      `Layer ${i + 1} direction from`,
                      {
                        kind: 'bearing',
                        unit: '° true',
                        compact: true,
                      },
                    )}
                  </td>
                  <td>
                    ${numberField(s, `winds.layers[${i}].speed_mps`, `Layer ${i + 1} speed`, {
                      kind: 'speed',
                      compact: true,
                    })}
                  </td>
                  <td class="act">
                    <button
                      title="Delete this layer"
                      aria-label=${`Delete layer ${i + 1}`}
                      @click=${() => this.removeAt(i)}
                    >
                      ✕
                    </button>
                  </td>
                </tr>
                ${messages(i)}`,
          )}
        </tbody>
      </table>
      ${layers.length === 0 ? html`<p class="muted">No layers: the air is calm.</p>` : ''}
      <div class="row-actions"><button @click=${this.add}>Add layer</button></div>
      <p class="muted">
        Components are interpolated linearly between layers; below the lowest layer the speed falls
        off toward the ground with the exponent set under Atmosphere.
      </p>
    `;
  }
}
