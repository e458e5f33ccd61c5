/**
 * The results tab: the plan's problems, the selected site's details, the results table, exports
 * and the result's notes.
 */
import { html, type TemplateResult } from 'lit';
import { exportAs, type ExportKind } from './downloads';
import type { PlanStore } from './plan-store';
import './sf-results-table';
import './sf-site-details';

/** The export buttons, in order, with their labels. */
const EXPORTS: [ExportKind, string][] = [
  ['geojson', 'GeoJSON'],
  ['kml', 'KML'],
  ['gpx', 'GPX'],
  ['csv', 'Schedule CSV'],
  ['sites', 'Sites CSV'],
];

/**
 * The results tab; csvBom is whether CSV exports start with a UTF-8 byte-order mark, and
 * setCsvBom changes it.
 */
export function renderResultsTab(
  s: PlanStore,
  csvBom: boolean,
  setCsvBom: (on: boolean) => void,
): TemplateResult {
  return html`${
      s.issues.length
        ? html`<h3>Problems to fix</h3>
            <ul class="issues">
              ${s.issues.map((i) => html`<li>${i.message}</li>`)}
            </ul>`
        : ''
    }
    <sf-site-details .store=${s}></sf-site-details>
    <sf-results-table .store=${s}></sf-results-table>
    <div class="exports" role="group" aria-label="Export">
      <span class="muted">Export:</span>
      ${EXPORTS.map(
        ([kind, label]) =>
          html`<button @click=${() => exportAs(s, kind, csvBom)}>${label}</button>`,
      )}
      <label class="muted"
        ><input
          type="checkbox"
          data-export="bom"
          .checked=${csvBom}
          @change=${(e: Event) => setCsvBom((e.target as HTMLInputElement).checked)}
        />
        CSV with byte-order mark (for spreadsheets)</label
      >
    </div>
    ${
      s.result
        ? html`<p class="muted">
            Declination ${s.result.declination_deg?.toFixed(2) ?? '—'}°
            (${s.result.declinationModel ?? 'unavailable'}).
            ${
              s.result.track.groundSpeed_mps > 0
                ? 'Window times are seconds relative to passing the release point (negative = before).'
                : 'Hovering: each site is planned from its own hover point.'
            }
          </p>`
        : ''
    }`;
}
