import { css, html } from 'lit';
import { customElement } from 'lit/decorators.js';
import { CAUTION_TEXT } from '../brief';
import { DEFAULT_SAFETY_SETTINGS } from '../safety';
import type { PlanStore } from './plan-store';
import { sharedStyles } from './shared-styles';
import { StoreElement } from './store-element';
import { numberField } from './sf-number-field';
import { formatQuantity, type Quantity } from './units';
import { checksList, readinessState, readinessStyles } from './safety-readiness';
import { CrewChecklist, crewChecklistStyles } from './crew-checklist';
import { SafetySignOff, signOffStyles } from './safety-signoff';
import { noDropZones } from './no-drop-zones';

/** The safety settings a crew matches to local rules; empty means the default shown. */
function safetySettings(s: PlanStore) {
  const u = s.settings.units;
  const d = DEFAULT_SAFETY_SETTINGS;
  const n = (path: string, label: string, kind: Quantity, def: number) =>
    numberField(s, path, label, {
      kind,
      optional: true,
      // The default in the reader's unit, rounded by the same rule as the field (units.ts).
      placeholder: `${formatQuantity(def, kind, u)} (default)`,
    });
  return html`${n('safety.ceiling_m', 'Release ceiling above ground', 'height', d.ceiling_m)}
  ${n('safety.noDropBuffer_m', 'Clearance from no-drop zones', 'distance', d.noDropBuffer_m)}
  ${n('safety.hazardBuffer_m', 'Margin around the hazard area', 'distance', d.hazardBuffer_m)}
  ${n('safety.thrustMargin_pct', 'Control time kept in reserve', 'percent', d.thrustMargin_pct)}
  ${n('safety.terrainClearance_m', 'Carrier above the terrain, at least', 'height', d.terrainClearance_m)}`;
}

/**
 * The safety checklist: automatic checks computed with every plan, the crew's own items with who
 * and when, no-drop zones, and the ready sign-off (a failing check needs a written reason).
 * Each part is its own module; this element places them with the caution and the settings.
 */
@customElement('sf-safety-panel')
export class SfSafetyPanel extends StoreElement {
  static styles = [
    sharedStyles,
    readinessStyles,
    crewChecklistStyles,
    signOffStyles,
    css`
      :host {
        display: block;
      }
      .caution {
        background: var(--sf-warn-bg);
        border-left: 4px solid var(--sf-warn-line);
        padding: 6px 8px;
        font-size: 13px;
      }
      .row {
        display: flex;
        gap: 6px;
        flex-wrap: wrap;
        align-items: center;
        margin-top: 6px;
      }
    `,
  ];

  private readonly signOff = new SafetySignOff(this);
  private readonly crew = new CrewChecklist(this);
  /** The site buttons of the checks show which site is selected. */
  private readonly onSelect = (): void => this.requestUpdate();

  connectedCallback(): void {
    super.connectedCallback();
    this.store?.addEventListener('select-site', this.onSelect);
  }

  disconnectedCallback(): void {
    this.store?.removeEventListener('select-site', this.onSelect);
    super.disconnectedCallback();
  }

  render() {
    const s = this.store;
    if (!s) return html``;
    return html`
      <p class="caution" role="note">${CAUTION_TEXT}</p>
      ${readinessState(s)}
      <h3>Automatic checks</h3>
      ${checksList(s)}
      <h3>Crew checklist</h3>
      ${this.crew.render(s, () => this.signOff.signer)}
      <h3>Sign-off</h3>
      ${this.signOff.render()}
      <h3>Settings (match local rules)</h3>
      ${safetySettings(s)} ${noDropZones(s)}
    `;
  }
}
