import { css, html } from 'lit';
import { customElement, state } from 'lit/decorators.js';
import { schemaMaxItems } from '../formats';
import { FRAME_LIMIT_M, type Site, type Variant } from '../plan';
import { importSitesFile, tooLarge } from './import-file';
import { sharedStyles } from './shared-styles';
import { StoreElement } from './store-element';
import './sf-coord-field';
import { numberField } from './sf-number-field';
import { takePickedFile } from './picked-file';
import { errorText } from './safe-storage';

/** Next free site id of the form s01, s02, … */
export function nextSiteId(sites: { id?: unknown }[]): string {
  const used = new Set(sites.map((s) => String(s.id)));
  for (let i = sites.length + 1; ; i++) {
    const id = `s${String(i).padStart(2, '0')}`;
    if (!used.has(id)) return id;
  }
}

/** The sensor sites: id, name, position, ground, tolerance and an optional pinned variant. */
@customElement('sf-sites-panel')
export class SfSitesPanel extends StoreElement {
  static styles = [
    sharedStyles,
    css`
      :host {
        display: block;
      }
      input.id {
        width: 4.5em;
      }
      input.name {
        width: 8em;
      }
      table {
        min-width: 980px;
      }
      .row-actions {
        margin-top: 6px;
        display: flex;
        gap: 6px;
        align-items: center;
      }
      td {
        white-space: nowrap;
      }
      .scroll {
        overflow-x: auto;
      }
      .problems li {
        color: var(--sf-bad);
      }
    `,
  ];

  @state() private problems: string[] = [];
  /** Name of the file being imported, '' when none. */
  @state() private importing = '';

  private sites(): Site[] {
    return this.store?.list<Site>('sites') ?? [];
  }

  private add(): void {
    const s = this.store;
    if (!s) return;
    const sites = this.sites();
    const ids = s.rows<Site>('sites');
    const lat = Number(s.get('release.lat')) || 0;
    const lon = Number(s.get('release.lon')) || 0;
    // A new site starts 100 m east of the release point; drag it or type its position.
    const dLon = 100 / (111320 * Math.cos((lat * Math.PI) / 180) || 1);
    s.edit('sites', [...sites, { id: nextSiteId(ids), lat, lon: +(lon + dLon).toFixed(6) }]);
  }

  /**
   * Adds the sites of a CSV, GeoJSON or KML file; bad rows are listed, good ones kept. Large files
   * are read in a worker; reading stops at the plan's site limit, and the notice says so.
   */
  private async importFile(e: Event): Promise<void> {
    const s = this.store;
    const file = takePickedFile(e);
    if (!s || !file) return;
    const big = tooLarge(file);
    if (big) {
      this.problems = [big];
      s.setNotice('error', `${file.name}: ${big}; the plan is unchanged.`);
      return;
    }
    const before = this.sites();
    const variants = s.list<Variant>('variants').map((v) => String(v.id));
    this.importing = file.name;
    let r;
    try {
      const lat = s.get('release.lat');
      const lon = s.get('release.lon');
      r = await importSitesFile(file, {
        existingIds: before.map((x) => String(x.id)),
        variantIds: variants,
        // Sites the plan could not hold (too far from the release) are reported, not added.
        ...(typeof lat === 'number' && typeof lon === 'number'
          ? { near: { lat, lon, maxDistance_m: FRAME_LIMIT_M } }
          : {}),
      });
    } catch (err) {
      const why = errorText(err);
      this.problems = [`${file.name}: the file could not be read: ${why}`];
      s.setNotice(
        'error',
        `${file.name}: the file could not be read (${why}); the plan is unchanged.`,
      );
      return;
    } finally {
      this.importing = '';
    }
    const problems = r.problems.map((p) => p.message);
    // Sites added while the file was read leave less room: keep the first that still fit.
    const sites = this.sites();
    const max = schemaMaxItems('sites');
    let added = r.sites;
    if (sites.length + added.length > max) {
      added = added.slice(0, Math.max(0, max - sites.length));
      problems.push(
        `only the first ${added.length} sites were read (the plan holds at most ${max}, ${sites.length} already in it)`,
      );
    }
    this.problems = problems;
    if (added.length) s.edit('sites', [...sites, ...added]);
    const limit = problems.find(
      (p) => p.startsWith('only the first') || p.startsWith('the plan already holds'),
    );
    s.setNotice(
      problems.length ? 'error' : 'info',
      `${file.name}: ${added.length} site(s) added` +
        (limit ? `; ${limit}` : '') +
        (problems.length ? `. ${problems.length} problem(s) listed under Sites.` : '.'),
    );
  }

  private removeAt(i: number): void {
    this.store?.edit(
      'sites',
      this.sites().filter((_, j) => j !== i),
    );
  }

  render() {
    const s = this.store;
    if (!s) return html``;
    // rows(): an entry that is not an object shows as an empty row, never breaks the table.
    const sites = s.rows<Site>('sites');
    const variants = s.rows<Variant>('variants');
    const u = s.settings.units;
    const text = (i: number, key: 'id' | 'name', cls: string) => {
      const path = `sites[${i}].${key}`;
      const msg = s.messageAt(path);
      return html`<input
          class=${cls}
          aria-label=${`Site ${i + 1} ${key}`}
          data-path=${path}
          .value=${String(s.get(path) ?? '')}
          aria-invalid=${msg ? 'true' : 'false'}
          @change=${(e: Event) => {
            const v = (e.target as HTMLInputElement).value;
            s.edit(path, key === 'name' && v === '' ? undefined : v);
          }}
        />${msg ? html`<div class="field-error" role="alert">${msg}</div>` : ''}`;
    };
    const cell = (
      i: number,
      key: string,
      what: string,
      kind: 'plain' | 'length',
      unit: string,
      optional = false,
    ) =>
      html`<td>
        ${numberField(s, `sites[${i}].${key}`, `Site ${i + 1} ${what}`, { kind, unit, optional, compact: true })}
      </td>`;
    return html`
      <h3>Sensor sites (${sites.length})</h3>
      <div class="scroll">
        <table>
          <thead>
            <tr>
              <th>Id</th>
              <th>Name</th>
              <th>Position (${u.coords === 'decimal' ? 'lat, lon' : u.coords.toUpperCase()})</th>
              <th>Lat °</th>
              <th>Lon °</th>
              <th>Ground (${u.length} MSL)</th>
              <th>Tolerance (${u.length})</th>
              <th>Variant</th>
              <th></th>
            </tr>
          </thead>
          <tbody>
            ${sites.map((site, i) => {
              const pinPath = `sites[${i}].variant`;
              const pinMsg = s.messageAt(pinPath);
              return html`<tr data-site-row=${String(site.id)}>
                <td>${text(i, 'id', 'id')}</td>
                <td>${text(i, 'name', 'name')}</td>
                <td>
                  <sf-coord-field
                    compact
                    .store=${s}
                    path=${`sites[${i}]`}
                    label=${`Site ${i + 1} position`}
                  ></sf-coord-field>
                </td>
                ${cell(i, 'lat', 'latitude', 'plain', '°')}
                ${cell(i, 'lon', 'longitude', 'plain', '°')}
                ${cell(i, 'elevation_m', 'ground elevation', 'length', '', true)}
                ${cell(i, 'tolerance_m', 'tolerance', 'length', '', true)}
                <td>
                  <select
                    aria-label=${`Site ${i + 1} variant`}
                    data-path=${pinPath}
                    @change=${(e: Event) => {
                      const v = (e.target as HTMLSelectElement).value;
                      s.edit(pinPath, v === '' ? undefined : v);
                    }}
                  >
                    <option value="" ?selected=${site.variant === undefined}>recommended</option>
                    ${variants.map((v) => html`<option value=${String(v.id)} ?selected=${site.variant === v.id}>${String(v.id)}</option>`)}
                  </select>
                  ${pinMsg ? html`<div class="field-error" role="alert">${pinMsg}</div>` : ''}
                </td>
                <td>
                  <button
                    aria-label=${`Delete site ${site.id}`}
                    title="Delete this site"
                    @click=${() => this.removeAt(i)}
                  >
                    ✕
                  </button>
                </td>
              </tr>`;
            })}
          </tbody>
        </table>
      </div>
      <div class="row-actions">
        <button @click=${this.add}>Add site</button>
        <span class="muted">or switch on “Add sites by clicking” above the map.</span>
      </div>
      <div class="row-actions">
        <label
          >Import sites (CSV with lat/lon, UTM or MGRS columns; GeoJSON points; KML placemarks)
          <input
            type="file"
            accept=".csv,.txt,.json,.geojson,.kml"
            data-testid="import-sites"
            ?disabled=${this.importing !== ''}
            @change=${this.importFile}
          />
        </label>
        ${this.importing ? html`<span class="muted" role="status">Reading ${this.importing}…</span>` : ''}
      </div>
      ${
        this.problems.length
          ? html`<div class="problems" role="alert">
              <h3>Import problems (${this.problems.length})</h3>
              <ul>
                ${this.problems.map((p) => html`<li>${p}</li>`)}
              </ul>
              <button @click=${() => (this.problems = [])}>Dismiss</button>
            </div>`
          : ''
      }
    `;
  }
}
