import { css, html } from 'lit';
import { customElement, property } from 'lit/decorators.js';
import { SfFieldBase, fieldStyles } from './sf-field-base';

/** A labelled text input (or a select when `options` is set) bound to one plan path. */
@customElement('sf-text-field')
export class SfTextField extends SfFieldBase {
  static styles = [
    fieldStyles('min(18em, 60%)'),
    css`
      input,
      select {
        width: 100%;
        box-sizing: border-box;
      }
    `,
  ];

  @property() placeholder = '';
  /** Choices for a select: [value, label] pairs. */
  @property({ attribute: false }) options?: [string, string][];
  /** An empty input removes the value so its default applies. */
  @property({ type: Boolean }) optional = false;
  /** What a select shows while the plan leaves the value out (the default that then applies). */
  @property() fallback = '';

  constructor() {
    super('sf-text');
  }

  private onChange(e: Event): void {
    const v = (e.target as HTMLInputElement | HTMLSelectElement).value;
    this.store?.edit(this.path, this.optional && v === '' ? undefined : v);
  }

  render() {
    const s = this.store;
    const raw = s?.get(this.path);
    const value = raw === undefined || raw === null ? this.fallback : String(raw);
    const msg = s?.messageAt(this.path);
    const control = this.options
      ? html`<select
          id=${this.inputId}
          data-path=${this.path}
          .value=${value}
          @change=${this.onChange}
        >
          ${this.options.map(([v, l]) => html`<option value=${v} ?selected=${v === value}>${l}</option>`)}
        </select>`
      : html`<input
          id=${this.inputId}
          data-path=${this.path}
          .value=${value}
          placeholder=${this.placeholder}
          aria-invalid=${msg ? 'true' : 'false'}
          @change=${this.onChange}
        />`;
    return html`${this.labelled(control)}
      <div class="field-error" role=${msg ? 'alert' : 'none'}>${msg ?? ''}</div>`;
  }
}
