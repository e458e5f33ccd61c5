/** The Terrain section of the plan panel: open an elevation model, what was read, remove it. */
import { css, html, nothing } from 'lit';
import { customElement } from 'lit/decorators.js';
import { boxText } from '../formats';
import { terrainArea } from '../planner';
import { takePickedFile } from './picked-file';
import { factListStyles, sharedStyles } from './shared-styles';
import { StoreElement } from './store-element';
import { boxInside } from './terrain-loader';
import { formatQuantity } from './units';

/** "12.3 MB", "456 kB", "789 bytes" (decimal units). */
function bytesText(n: number): string {
  if (n >= 1e6) return `${(n / 1e6).toFixed(1)} MB`;
  if (n >= 1e3) return `${(n / 1e3).toFixed(1)} kB`;
  return `${n} bytes`;
}

const count = (n: number): string => n.toLocaleString('en-US');

/** The elevation model the plan is flown over: a file input, its state and what it covers. */
@customElement('sf-terrain-section')
export class SfTerrainSection extends StoreElement {
  static styles = [
    sharedStyles,
    factListStyles,
    css`
      :host {
        display: block;
      }
      label {
        display: grid;
        gap: 2px;
        margin: 4px 0;
      }
      .error {
        color: var(--sf-bad);
        font-weight: 600;
        overflow-wrap: anywhere;
        margin: 4px 0;
      }
      .hint {
        font-size: 12px;
        color: var(--sf-muted);
        margin: 2px 0 4px;
      }
    `,
  ];

  private onPick(e: Event): void {
    const s = this.store;
    const file = takePickedFile(e);
    if (!s || !file) return;
    void s.terrain.open(file, file.name);
  }

  private renderModel() {
    const s = this.store!;
    const dem = s.dem;
    const info = s.terrain.info;
    if (!dem) return nothing;
    const g = dem.grid;
    const u = s.settings.units;
    let covers = '';
    if (s.plan && info) {
      try {
        covers = boxInside(terrainArea(s.plan), info.box)
          ? 'covers the plan area'
          : s.terrainStatus.state === 'loading'
            ? 'read for an earlier plan area; being read again'
            : 'read for an earlier plan area, not the current one';
      } catch {
        covers = '';
      }
    }
    return html`<dl data-testid="terrain-model">
        <dt>Model</dt>
        <dd data-testid="terrain-name">${dem.name}</dd>
        <dt>Read</dt>
        <dd data-testid="terrain-read">
          ${count(g.cols)} × ${count(g.rows)} = ${count(g.cols * g.rows)}
          cells${
            info
              ? html` of ${count(info.fileCols)} × ${count(info.fileRows)};
                ${bytesText(info.bytesRead)} of ${bytesText(info.fileBytes)}`
              : nothing
          }
        </dd>
        <dt>Cell size</dt>
        <dd data-testid="terrain-cell">
          ${formatQuantity(dem.cellSize_m(), 'distance', u)} (EPSG:${g.epsg})
        </dd>
        <dt>Area read</dt>
        <dd data-testid="terrain-area">
          ${info ? boxText(info.box) : boxText(dem.bounds())}${covers ? html`; ${covers}` : nothing}
        </dd>
      </dl>
      <button data-testid="terrain-remove" @click=${() => void s.terrain.remove()}>
        Remove elevation model
      </button>`;
  }

  render() {
    const s = this.store;
    if (!s) return html``;
    const st = s.terrainStatus;
    return html`
      <label
        >Elevation model file (.tif, .tiff GeoTIFF or .asc ASCII grid; heights in metres above sea
        level)
        <input
          type="file"
          accept=".tif,.tiff,.asc"
          data-testid="terrain-file"
          @change=${(e: Event) => this.onPick(e)}
      /></label>
      ${
        st.state === 'loading'
          ? html`<p role="status" data-testid="terrain-loading">
              Reading ${st.name}…${st.message ? html` ${st.message}` : nothing}
            </p>`
          : nothing
      }
      ${
        st.state !== 'loading' && st.message
          ? html`<p class="error" role="alert" data-testid="terrain-error">${st.message}</p>`
          : nothing
      }
      ${
        s.dem
          ? this.renderModel()
          : html`<p class="hint" data-testid="terrain-none">
                No elevation model in use: every descent ends on flat ground at its site's typed
                elevation.
              </p>
              ${
                s.terrain.fileName
                  ? html`<p>
                      Kept in this browser:
                      <span data-testid="terrain-kept">${s.terrain.fileName}</span>
                      <button data-testid="terrain-remove" @click=${() => void s.terrain.remove()}>
                        Remove it
                      </button>
                    </p>`
                  : nothing
              }`
      }
      <p class="hint">
        Only the part of the file around the plan area is read. An .asc grid is read in WGS 84
        degrees, or in the release point's UTM zone when its corner cannot be degrees. The file is
        kept in this browser for the next visit and for use offline. Each descent ends where it
        meets this ground; the release altitude and wind layers given above ground (AGL) stay
        referred to the plan's ground elevation above.
      </p>
    `;
  }
}
