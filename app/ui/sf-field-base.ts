// The shared part of the labelled plan fields (sf-number-field, sf-text-field, sf-coord-field).
import { css, html, unsafeCSS, type CSSResultGroup, type TemplateResult } from 'lit';
import { property } from 'lit/decorators.js';
import { sharedStyles } from './shared-styles';
import { StoreElement } from './store-element';

const nextIds = new Map<string, number>();

/** A page-unique element id per field kind: `${prefix}-0`, `${prefix}-1`, … */
function fieldId(prefix: string): string {
  const n = nextIds.get(prefix) ?? 0;
  nextIds.set(prefix, n + 1);
  return `${prefix}-${n}`;
}

/** Styles of a field whose label sits beside a control column `controlWidth` wide (CSS length). */
export function fieldStyles(controlWidth: string): CSSResultGroup {
  return [
    sharedStyles,
    css`
      :host {
        display: block;
      }
      label {
        display: grid;
        grid-template-columns: 1fr ${unsafeCSS(controlWidth)};
        gap: 6px;
        align-items: center;
      }
    `,
  ];
}

/**
 * A labelled control bound to one plan path, with a page-unique id for its input.
 */
export abstract class SfFieldBase extends StoreElement {
  @property() path = '';
  @property() label = '';

  protected readonly inputId: string;

  constructor(idPrefix: string) {
    super();
    this.inputId = fieldId(idPrefix);
  }

  /** The label beside its control, in the two-column grid of fieldStyles(). */
  protected labelled(control: TemplateResult): TemplateResult {
    return html`<label for=${this.inputId}><span>${this.label}</span>${control}</label>`;
  }
}
