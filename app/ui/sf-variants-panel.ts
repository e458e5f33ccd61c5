import { css, html } from 'lit';
import { customElement } from 'lit/decorators.js';
import type { Variant } from '../plan';
import { sharedStyles, VARIANT_COLOURS } from './shared-styles';
import { StoreElement } from './store-element';
import { numberField, type FieldKind } from './sf-number-field';
import './sf-text-field';

const GUIDANCE: [string, string][] = [
  ['passive', 'passive (no steering)'],
  ['fixed-heading', 'fixed heading (programmed)'],
  ['homing', 'homing (closed loop)'],
];

/** The vehicle catalogue of the plan, one card per variant, in recommendation order. */
@customElement('sf-variants-panel')
export class SfVariantsPanel extends StoreElement {
  static styles = [
    sharedStyles,
    css`
      :host {
        display: block;
      }
      .card {
        border: 1px solid var(--sf-line);
        border-left: 6px solid var(--c);
        border-radius: 6px;
        padding: 6px 8px;
        margin-bottom: 8px;
        background: #fff;
        display: grid;
        gap: 2px;
      }
      .head {
        display: flex;
        justify-content: space-between;
        align-items: center;
        gap: 6px;
      }
      .head input {
        font-weight: 600;
        width: 10em;
      }
    `,
  ];

  private variants(): Variant[] {
    return this.store?.list<Variant>('variants') ?? [];
  }

  private add(): void {
    const v = this.variants();
    const ids = this.store?.rows<Variant>('variants').map((x) => x.id) ?? [];
    let n = v.length + 1;
    while (ids.includes(`variant-${n}`)) n++;
    this.store?.edit('variants', [
      ...v,
      { id: `variant-${n}`, guidance: 'passive', descentRate_mps: 3, maxWind_mps: 10 },
    ]);
  }

  private move(i: number, d: number): void {
    const v = [...this.variants()];
    const j = i + d;
    if (j < 0 || j >= v.length) return;
    [v[i], v[j]] = [v[j], v[i]];
    this.store?.edit('variants', v);
  }

  private removeAt(i: number): void {
    this.store?.edit(
      'variants',
      this.variants().filter((_, j) => j !== i),
    );
  }

  render() {
    const s = this.store;
    if (!s) return html``;
    // Read through rows(): an entry that is not an object shows as an empty card.
    const list = s.rows<Variant>('variants');
    const n = (i: number, key: string, label: string, kind: FieldKind, optional = true) =>
      numberField(s, `variants[${i}].${key}`, label, { kind, optional });
    return html`
      <h3>Vehicle variants</h3>
      <p class="muted">
        Each site gets the cheapest variant that meets the required P(hit); at equal cost, the first
        in this order.
      </p>
      ${list.map((v, i) => {
        const idPath = `variants[${i}].id`;
        const idMsg = s.messageAt(idPath);
        const steered = v.guidance !== 'passive';
        return html`<div
          class="card"
          style=${`--c:${VARIANT_COLOURS[i % VARIANT_COLOURS.length]}`}
          data-variant=${String(v.id)}
        >
          <div class="head">
            <input
              aria-label=${`Variant ${i + 1} id`}
              data-path=${idPath}
              .value=${String(v.id ?? '')}
              @change=${(e: Event) => s.edit(idPath, (e.target as HTMLInputElement).value)}
            />
            <span>
              <button
                aria-label="Move up"
                title="Earlier in the catalogue"
                ?disabled=${i === 0}
                @click=${() => this.move(i, -1)}
              >
                ↑
              </button>
              <button
                aria-label="Move down"
                title="Later in the catalogue"
                ?disabled=${i === list.length - 1}
                @click=${() => this.move(i, 1)}
              >
                ↓
              </button>
              <button
                aria-label=${`Delete variant ${v.id}`}
                title="Delete this variant"
                @click=${() => this.removeAt(i)}
              >
                ✕
              </button>
            </span>
          </div>
          ${idMsg ? html`<div class="field-error" role="alert">${idMsg}</div>` : ''}
          <sf-text-field
            .store=${s}
            path=${`variants[${i}].name`}
            label="Name"
            optional
          ></sf-text-field>
          <sf-text-field
            .store=${s}
            path=${`variants[${i}].guidance`}
            label="Guidance"
            .options=${GUIDANCE}
          ></sf-text-field>
          ${n(i, 'descentRate_mps', 'Descent rate in standard sea-level air (1.225 kg/m³)', 'speed', false)}
          ${
            steered
              ? html`${n(i, 'glideAngle_deg', 'Glide angle below the horizon', 'angle')}
                ${n(i, 'controlTime_s', 'Steering time (thrust)', 'time')}
                ${n(i, 'entryLoss_m', 'Height lost before steering starts', 'height')}`
              : ''
          }
          ${n(i, 'referenceMass_kg', 'Mass when the descent rate was measured', 'mass')}
          ${n(i, 'payloadMass_kg', 'Mass as flown in this plan', 'mass')}
          ${n(i, 'throwTime_s', 'Forward-throw time (empty: from the descent rate)', 'time')}
          ${n(i, 'maxWind_mps', 'Wind limit (largest wind it may fly in)', 'speed')}
          ${n(i, 'cost', 'Cost of one (any unit, the same for all)', 'cost')}
        </div>`;
      })}
      <button @click=${this.add}>Add variant</button>
    `;
  }
}
