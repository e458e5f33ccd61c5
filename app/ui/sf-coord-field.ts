import { css, html } from 'lit';
import { customElement, property } from 'lit/decorators.js';
import { formatCoord } from './units';
import { SfFieldBase, fieldStyles } from './sf-field-base';

/**
 * A position shown in the user's coordinate format (decimal, DMS, UTM or MGRS) that accepts any
 * of those forms when typed; bound to the object at `path` (its lat and lon).
 */
@customElement('sf-coord-field')
export class SfCoordField extends SfFieldBase {
  static styles = [
    fieldStyles('min(16em, 60%)'),
    css`
      input {
        width: 100%;
        box-sizing: border-box;
      }
    `,
  ];

  label = 'Position';
  @property({ type: Boolean }) compact = false;

  constructor() {
    super('sf-coord');
  }

  private text(): string {
    const s = this.store;
    if (!s) return '';
    const typed = s.texts.get(`${this.path}.position`);
    if (typed) return typed.text;
    const lat = s.get(`${this.path}.lat`);
    const lon = s.get(`${this.path}.lon`);
    if (typeof lat !== 'number' || typeof lon !== 'number') return '';
    return formatCoord({ lat, lon }, s.settings.units.coords);
  }

  render() {
    const s = this.store;
    const key = `${this.path}.position`;
    const msg = s?.messageAt(key);
    const input = html`<input
      id=${this.inputId}
      class=${this.compact ? 'compact' : ''}
      data-path=${key}
      aria-label=${this.compact ? this.label : undefined}
      .value=${this.text()}
      aria-invalid=${msg ? 'true' : 'false'}
      title="Decimal degrees, DMS (47°29′34″N 21°04′44″E), UTM (34T 657425 5262364) or MGRS"
      @change=${(e: Event) => s?.editPosition(this.path, (e.target as HTMLInputElement).value)}
    />`;
    return html`${this.compact ? input : this.labelled(input)}
    ${msg ? html`<div class="field-error" role="alert">${msg}</div>` : ''}`;
  }
}
