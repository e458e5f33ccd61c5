import { css, html, type TemplateResult } from 'lit';
import { customElement, property } from 'lit/decorators.js';
import {
  DEFAULT_UNITS,
  fieldText,
  fromDisplay,
  parseNumber,
  quantityUnit,
  type Quantity,
} from './units';
import type { PlanStore } from './plan-store';
import { SfFieldBase, fieldStyles } from './sf-field-base';

/**
 * What a field holds: a quantity (shown in the user's unit for lengths and speeds, rounded by the
 * quantity's rule), 'length' (a horizontal distance), or 'plain' (shown as stored, no unit rule).
 */
export type FieldKind = Quantity | 'length' | 'plain';

/**
 * A labelled number input bound to one plan path. Text that does not read as a number, or a
 * value out of range, is kept as typed and explained beside the field.
 */
@customElement('sf-number-field')
export class SfNumberField extends SfFieldBase {
  static styles = [
    fieldStyles('9.5em'),
    css`
      .unit {
        color: var(--sf-muted);
        font-size: 12px;
        margin-left: 3px;
        white-space: nowrap;
        /* One slot for every unit ("m" … "° true"), so the inputs of a panel line up. */
        flex: 0 0 3.3em;
      }
      input {
        width: 100%;
        box-sizing: border-box;
        text-align: right;
      }
      .box {
        display: flex;
        align-items: center;
      }
      input.compact {
        width: 100%;
        max-width: 7em;
      }
    `,
  ];

  @property() kind: FieldKind = 'plain';
  /** Unit label for plain fields (e.g. "°", "K", "%"). */
  @property() unit = '';
  /** When the field is optional, an empty input removes the value (the default applies). */
  @property({ type: Boolean }) optional = false;
  @property() placeholder = '';
  /**
   * Table-cell form: no visible label (it becomes the accessible name), no unit, and no message
   * of its own (the field is marked invalid; the table shows the row's messages full width).
   */
  @property({ type: Boolean }) compact = false;

  constructor() {
    super('sf-num');
  }

  private quantity(): Quantity | undefined {
    if (this.kind === 'plain') return undefined;
    return this.kind === 'length' ? 'distance' : this.kind;
  }

  /** The unit shown: the preferred one for lengths and speeds, else `unit` or the quantity's. */
  private unitLabel(): string {
    const q = this.quantity();
    const u = this.store?.settings.units ?? DEFAULT_UNITS;
    if (!q) return this.unit;
    const converted = q === 'distance' || q === 'height' || q === 'speed';
    return converted ? quantityUnit(q, u) : this.unit || quantityUnit(q, u);
  }

  private fromDisplay(v: number): number {
    const q = this.quantity();
    const u = this.store?.settings.units;
    return q && u ? fromDisplay(v, q, u) : v;
  }

  // The input's value is bound without lit's live(): lit then writes it only when the value to
  // show changes, so a planning result arriving while someone types never overwrites their text.
  private text(): string {
    const s = this.store;
    if (!s) return '';
    const typed = s.texts.get(this.path);
    if (typed) return typed.text;
    const v = s.get(this.path);
    if (typeof v !== 'number') return v === undefined || v === null ? '' : String(v);
    const q = this.quantity();
    // Rounded by the quantity's rule in the shown unit; the plan keeps the exact value.
    return q ? fieldText(v, q, s.settings.units) : String(v);
  }

  private onChange(e: Event): void {
    const s = this.store;
    if (!s) return;
    const text = (e.target as HTMLInputElement).value;
    if (this.optional && text.trim() === '') {
      s.edit(this.path, undefined);
      return;
    }
    s.editText(this.path, text, (t) => {
      const r = parseNumber(t);
      return r.ok ? { ok: true, value: this.fromDisplay(r.value) } : r;
    });
  }

  render() {
    const msg = this.store?.messageAt(this.path);
    if (this.compact) {
      return html`<input
        class="compact"
        aria-label=${this.unitLabel() ? `${this.label} (${this.unitLabel()})` : this.label}
        inputmode="decimal"
        .value=${this.text()}
        aria-invalid=${msg ? 'true' : 'false'}
        title=${msg ?? ''}
        data-path=${this.path}
        @change=${this.onChange}
      />`;
    }
    return html`${this.labelled(
        html`<span class="box">
          <input
            id=${this.inputId}
            inputmode="decimal"
            .value=${this.text()}
            placeholder=${this.placeholder}
            aria-invalid=${msg ? 'true' : 'false'}
            aria-describedby=${`${this.inputId}-err`}
            data-path=${this.path}
            @change=${this.onChange}
          /><span class="unit">${this.unitLabel()}</span>
        </span>`,
      )}
      <div class="field-error" id=${`${this.inputId}-err`} role=${msg ? 'alert' : 'none'}>
        ${msg ?? ''}
      </div>`;
  }
}

/** Options of numberField(). */
export interface NumberFieldOptions {
  kind?: FieldKind;
  unit?: string;
  optional?: boolean;
  placeholder?: string;
  compact?: boolean;
}

/** An <sf-number-field> bound to a plan path: the one way the panels place number inputs. */
export function numberField(
  store: PlanStore,
  path: string,
  label: string,
  o: NumberFieldOptions = {},
): TemplateResult {
  return html`<sf-number-field
    .store=${store}
    path=${path}
    label=${label}
    kind=${o.kind ?? 'plain'}
    unit=${o.unit ?? ''}
    placeholder=${o.placeholder ?? ''}
    ?optional=${o.optional ?? false}
    ?compact=${o.compact ?? false}
  ></sf-number-field>`;
}
