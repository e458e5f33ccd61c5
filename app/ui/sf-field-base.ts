// The shared part of the labelled plan fields (sf-number-field, sf-text-field, sf-coord-field).
import { LitElement, css, html, unsafeCSS, type CSSResultGroup, type TemplateResult } from 'lit';
import { property } from 'lit/decorators.js';
import type { PlanStore } from './plan-store';
import { sharedStyles } from './shared-styles';
import { StoreController } from './store-controller';

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
 * A labelled control bound to one plan path: re-renders when the plan store changes and owns a
 * page-unique id for its input.
 */
export abstract class SfFieldBase extends LitElement {
  @property({ attribute: false }) store?: PlanStore;
  @property() path = '';
  @property() label = '';

  protected readonly inputId: string;

  constructor(idPrefix: string) {
    super();
    this.inputId = fieldId(idPrefix);
    new StoreController(this, () => this.store);
  }

  /** The label beside its control, in the two-column grid of fieldStyles(). */
  protected labelled(control: TemplateResult): TemplateResult {
    return html`<label for=${this.inputId}><span>${this.label}</span>${control}</label>`;
  }
}
