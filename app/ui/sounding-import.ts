// The sounding or profile CSV section of <sf-wind-sources>: pick a file, its winds go in.
import { html } from 'lit';
import { applyWindLayers } from './apply-wind-layers';
import { importSoundingFile, tooLarge } from './import-file';
import { takePickedFile } from './picked-file';
import type { WindSourcesHost } from './wind-sources-host';
import { errorText } from './safe-storage';

/** Reads the file picked in the section's input into the plan's winds (and temperatures). */
async function onSoundingFile(host: WindSourcesHost, e: Event): Promise<void> {
  const file = takePickedFile(e);
  if (!file) return;
  const big = tooLarge(file);
  if (big) {
    host.problems = [`${file.name}: ${big}`];
    host.store?.setNotice('error', `${file.name}: ${big}; the plan is unchanged.`);
    return;
  }
  let r;
  try {
    r = await importSoundingFile(file);
  } catch (err) {
    const why = errorText(err);
    host.problems = [`${file.name}: the file could not be read: ${why}`];
    host.store?.setNotice(
      'error',
      `${file.name}: the file could not be read (${why}); the plan is unchanged.`,
    );
    return;
  }
  host.problems = r.problems.map((p) => (p.line ? `line ${p.line}: ${p.message}` : p.message));
  const s = host.store;
  if (!s) return;
  if (r.layers.length === 0) {
    s.setNotice('error', `${file.name}: no usable wind rows; the plan is unchanged.`);
    return;
  }
  const ref = r.reference ?? (String(s.get('winds.reference') ?? 'AGL') as 'AGL' | 'MSL');
  applyWindLayers(s, ref, r.layers, r.temperatures, file.name, r.notUsed);
}

/** The section: the file input, and the way back to the ISA offset when a sounding is in use. */
export function soundingSection(host: WindSourcesHost) {
  const s = host.store;
  if (!s) return '';
  const sounding = s.get('atmosphere.sounding') as { levels?: unknown[] } | undefined;
  return html`<section>
    <h3>Sounding or profile file (CSV)</h3>
    <p class="muted">
      Columns altitude, direction, speed, and optionally temperature and pressure; units are read
      from the header (m/ft, m/s/kt/km/h, °C/K, hPa). Bad rows are listed and skipped.
    </p>
    <label
      >Open a sounding file
      <input
        type="file"
        accept=".csv,.txt"
        data-testid="sounding-file"
        @change=${(e: Event) => onSoundingFile(host, e)}
    /></label>
    ${
      sounding?.levels?.length
        ? html`<div class="row">
            <span>Density from the sounding’s ${sounding.levels.length} temperature(s).</span>
            <button @click=${() => s.edit('atmosphere.sounding', undefined)}>
              Use the ISA offset instead
            </button>
          </div>`
        : ''
    }
  </section>`;
}
