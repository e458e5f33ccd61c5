import { css, html } from 'lit';
import { customElement, state } from 'lit/decorators.js';
import { schemaMaxItems } from '../formats';
import { FRAME_LIMIT_M, type Site, type Variant } from '../plan';
import { importSitesFile, tooLarge } from './import-file';
import { sharedStyles } from './shared-styles';
import { StoreElement } from './store-element';
import './sf-coord-field';
import { numberField, type FieldKind } from './sf-number-field';
import { takePickedFile } from './picked-file';
import { errorText } from './safe-storage';
import { unitLabel } from './units';

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
      /* One site is one row on two lines, so every field fits a side panel of ~560 px:
         id · name · variant · delete, then position · lat · lon · ground · tolerance. The head
         row uses the same grid, so each heading sits over its column. Units are in the heads. */
      table,
      thead,
      tbody {
        display: block;
      }
      tr {
        display: grid;
        grid-template-columns:
          4.2em minmax(6em, 1fr) minmax(5.6em, 6.6em) minmax(5.6em, 6.6em)
          4.4em 4.4em 2.3em;
        grid-template-areas:
          'id name name variant variant variant del'
          'pos pos lat lon ground tol .';
        column-gap: 4px;
        row-gap: 2px;
        padding: 4px 0;
        border-bottom: 1px solid var(--sf-line);
        align-items: start;
      }
      thead tr {
        align-items: end;
        padding-top: 0;
      }
      th,
      td {
        border: none;
        padding: 0;
        min-width: 0;
      }
      th {
        line-height: 1.2;
      }
      .c-id {
        grid-area: id;
      }
      .c-name {
        grid-area: name;
      }
      .c-variant {
        grid-area: variant;
      }
      .c-del {
        grid-area: del;
        text-align: right;
      }
      .c-pos {
        grid-area: pos;
      }
      .c-lat {
        grid-area: lat;
      }
      .c-lon {
        grid-area: lon;
      }
      .c-ground {
        grid-area: ground;
      }
      .c-tol {
        grid-area: tol;
      }
      .c-msg {
        grid-column: 1 / -1;
      }
      td input,
      td select,
      td sf-coord-field,
      td sf-number-field {
        width: 100%;
        box-sizing: border-box;
      }
      td.c-del button {
        padding: 3px 7px;
      }
      .row-actions {
        margin-top: 6px;
        display: flex;
        gap: 6px;
        align-items: center;
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
        title=${msg ?? ''}
        @change=${(e: Event) => {
          const v = (e.target as HTMLInputElement).value;
          s.edit(path, key === 'name' && v === '' ? undefined : v);
        }}
      />`;
    };
    // The row's messages on a line of their own, full width: a narrow cell would wrap each word.
    // The position field shows its own message under itself.
    const rowMessages = (i: number) => {
      const keys = ['id', 'name', 'lat', 'lon', 'elevation_m', 'tolerance_m', 'variant'];
      const msgs = keys.map((k) => s.messageAt(`sites[${i}].${k}`)).filter((m) => m);
      return msgs.length
        ? html`<td class="c-msg" role="alert">
            ${msgs.map((m) => html`<div class="field-error">${m}</div>`)}
          </td>`
        : '';
    };
    const cell = (
      i: number,
      key: string,
      what: string,
      kind: FieldKind,
      cls: string,
      optional = false,
    ) =>
      html`<td class=${cls}>
        ${numberField(s, `sites[${i}].${key}`, `Site ${i + 1} ${what}`, { kind, optional, compact: true })}
      </td>`;
    return html`
      <h3>Sensor sites (${sites.length})</h3>
      <table>
        <thead>
          <tr>
            <th class="c-id">Id</th>
            <th class="c-name">Name</th>
            <th class="c-pos">
              Position (${u.coords === 'decimal' ? 'lat, lon' : unitLabel('coords', u.coords)})
            </th>
            <th class="c-lat">Lat °</th>
            <th class="c-lon">Lon °</th>
            <th class="c-ground">Ground ${u.length} MSL</th>
            <th class="c-tol">Tolerance ${u.length}</th>
            <th class="c-variant">Variant</th>
            <th class="c-del"></th>
          </tr>
        </thead>
        <tbody>
          ${sites.map((site, i) => {
            const pinPath = `sites[${i}].variant`;
            const pinMsg = s.messageAt(pinPath);
            return html`<tr data-site-row=${String(site.id)}>
              <td class="c-id">${text(i, 'id', 'id')}</td>
              <td class="c-name">${text(i, 'name', 'name')}</td>
              <td class="c-variant">
                <select
                  aria-label=${`Site ${i + 1} variant`}
                  aria-invalid=${pinMsg ? 'true' : 'false'}
                  title="The variant this site flies: the recommended one, or one pinned here"
                  data-path=${pinPath}
                  @change=${(e: Event) => {
                    const v = (e.target as HTMLSelectElement).value;
                    s.edit(pinPath, v === '' ? undefined : v);
                  }}
                >
                  <option value="" ?selected=${site.variant === undefined}>recommended</option>
                  ${variants.map((v) => html`<option value=${String(v.id)} ?selected=${site.variant === v.id}>${String(v.id)}</option>`)}
                </select>
              </td>
              <td class="c-del">
                <button
                  aria-label=${`Delete site ${site.id}`}
                  title="Delete this site"
                  @click=${() => this.removeAt(i)}
                >
                  ✕
                </button>
              </td>
              <td class="c-pos">
                <sf-coord-field
                  compact
                  .store=${s}
                  path=${`sites[${i}]`}
                  label=${`Site ${i + 1} position`}
                ></sf-coord-field>
              </td>
              ${cell(i, 'lat', 'latitude', 'coordinate', 'c-lat')}
              ${cell(i, 'lon', 'longitude', 'coordinate', 'c-lon')}
              ${cell(i, 'elevation_m', 'ground elevation', 'height', 'c-ground', true)}
              ${cell(i, 'tolerance_m', 'tolerance', 'distance', 'c-tol', true)} ${rowMessages(i)}
            </tr>`;
          })}
        </tbody>
      </table>
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
