/**
 * The base map part of the settings tab: open a PMTiles archive (kept in this browser), and fetch
 * the plan area's tiles from the tile URL for use offline, with the count and size shown first,
 * a limit, a progress bar and a cancel.
 */
import { css, html, nothing } from 'lit';
import { customElement, state } from 'lit/decorators.js';
import { terrainArea } from '../planner';
import {
  estimateFetch,
  fetchTiles,
  MAX_FETCH_ZOOM,
  mb,
  type FetchEstimate,
  type FetchProgress,
} from './basemap-fetch';
import { basemap } from './basemap-state';
import { takePickedFile } from './picked-file';
import { errorText } from './safe-storage';
import { factListStyles, sharedStyles } from './shared-styles';
import { StoreElement } from './store-element';

const count = (n: number): string => n.toLocaleString('en-US');
const ZOOMS = Array.from({ length: MAX_FETCH_ZOOM + 1 }, (_, i) => i);

/** The archive and the offline tiles: what is in use, what is kept, and the fetch. */
@customElement('sf-basemap-panel')
export class SfBasemapPanel extends StoreElement {
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
      .zooms {
        display: flex;
        gap: 12px;
      }
      .error {
        color: var(--sf-bad);
        font-weight: 600;
        overflow-wrap: anywhere;
      }
      .hint {
        font-size: 12px;
        color: var(--sf-muted);
        margin: 2px 0 4px;
      }
      progress {
        width: 100%;
      }
    `,
  ];

  @state() private zMin = 12;
  @state() private zMax = 16;
  @state() private progress: FetchProgress | null = null;
  private abort?: AbortController;
  private readonly onBasemap = (): void => this.requestUpdate();

  connectedCallback(): void {
    super.connectedCallback();
    basemap.addEventListener('change', this.onBasemap);
    void basemap.restore();
  }

  disconnectedCallback(): void {
    basemap.removeEventListener('change', this.onBasemap);
    super.disconnectedCallback();
  }

  private renderArchive() {
    const a = basemap.archive;
    const st = basemap.status;
    return html`
      <label
        >Base map archive (.pmtiles, PMTiles version 3; raster or MVT vector tiles)
        <input
          type="file"
          accept=".pmtiles"
          data-testid="basemap-file"
          @change=${(e: Event) => {
            const f = takePickedFile(e);
            if (f) void basemap.open(f);
          }}
      /></label>
      ${
        st.state === 'loading'
          ? html`<p role="status" data-testid="basemap-loading">Reading the archive…</p>`
          : nothing
      }
      ${st.message ? html`<p class="error" role="alert" data-testid="basemap-error">${st.message}</p>` : nothing}
      ${
        a
          ? html`<dl data-testid="basemap-archive">
                <dt>Archive</dt>
                <dd data-testid="basemap-name">${a.info.name}</dd>
                <dt>Tiles</dt>
                <dd data-testid="basemap-kind">
                  ${a.info.tileKind}, zooms ${a.info.minZoom} to ${a.info.maxZoom};
                  ${mb(a.info.bytes)}
                </dd>
                <dt>Attribution</dt>
                <dd data-testid="basemap-attribution">${a.info.attribution || 'none given'}</dd>
              </dl>
              ${
                a.info.kind === 'vector'
                  ? html`<p class="hint" data-testid="basemap-vector-note">
                      Vector tiles are drawn plainly in the app's own colours: land, land use,
                      water, buildings, roads and boundaries; names and points are left out.
                    </p>`
                  : a.info.kind === 'other'
                    ? html`<p class="error" data-testid="basemap-not-drawn">
                        ${a.info.tileKind} tiles cannot be drawn: the map shows the coordinate grid
                        (and the tile URL's tiles, if set). Open a raster (PNG, JPEG, WebP) or MVT
                        vector archive for a drawn base map.
                      </p>`
                    : nothing
              }
              <button data-testid="basemap-forget" @click=${() => void basemap.forget()}>
                Remove archive
              </button>`
          : html`<p class="hint" data-testid="basemap-none">No archive open.</p>`
      }
    `;
  }

  private estimate(): { est: FetchEstimate | null; why: string } {
    const s = this.store!;
    if (!s.settings.tileUrl) return { est: null, why: 'Set a tile URL above to fetch its tiles.' };
    if (!s.plan)
      return { est: null, why: 'The plan has errors: fix them to fetch the tiles of its area.' };
    if (this.zMin > this.zMax) return { est: null, why: 'The first zoom is above the last.' };
    try {
      return { est: estimateFetch(terrainArea(s.plan), this.zMin, this.zMax), why: '' };
    } catch (e) {
      return { est: null, why: `The plan area could not be worked out: ${errorText(e)}` };
    }
  }

  private async start(): Promise<void> {
    const s = this.store!;
    if (!s.plan || this.abort) return;
    const abort = new AbortController();
    this.abort = abort;
    const template = s.settings.tileUrl;
    try {
      await fetchTiles(
        basemap.plan,
        template,
        terrainArea(s.plan),
        this.zMin,
        this.zMax,
        abort.signal,
        (p) => {
          this.progress = { ...p, failures: [...p.failures] };
        },
      );
    } catch (e) {
      this.progress = {
        ...(this.progress ?? { total: 0, done: 0, kept: 0, failed: 0, bytes: 0, failures: [] }),
        state: 'stopped',
        message: errorText(e),
      };
    } finally {
      this.abort = undefined;
      await basemap.recount();
    }
  }

  private zoomPick(label: string, testid: string, value: number, set: (z: number) => void) {
    return html`<label
      >${label}
      <select
        data-testid=${testid}
        ?disabled=${this.abort !== undefined}
        @change=${(e: Event) => set(Number((e.target as HTMLSelectElement).value))}
      >
        ${ZOOMS.map((z) => html`<option value=${z} ?selected=${z === value}>${z}</option>`)}
      </select></label
    >`;
  }

  private renderProgress(p: FetchProgress) {
    const words =
      p.state === 'running'
        ? 'Fetching'
        : p.state === 'finished'
          ? 'Finished'
          : p.state === 'cancelled'
            ? 'Cancelled'
            : 'Stopped';
    return html`<progress
        data-testid="basemap-progress"
        max=${Math.max(1, p.total)}
        .value=${p.done}
        aria-label="Tiles fetched"
      ></progress>
      <p role="status" data-testid="basemap-fetch-status">
        ${words}: ${count(p.done)} of ${count(p.total)} tiles; ${count(p.kept)} kept
        (${mb(p.bytes)}), ${count(p.failed)} failed${p.message ? html` — ${p.message}` : nothing}.
      </p>
      ${
        p.failures.length
          ? html`<ul class="error" data-testid="basemap-failures">
              ${p.failures.map((f) => html`<li>${f}</li>`)}
            </ul>`
          : nothing
      }`;
  }

  private renderFetch() {
    const { est, why } = this.estimate();
    const running = this.abort !== undefined;
    return html`
      <h4>Tiles for use offline</h4>
      <p class="hint">
        While online, fetch the tile URL's tiles over the plan area; the map draws them from this
        browser first, so they are there without a network; offline, a closer view than the last
        zoom kept is drawn from that zoom enlarged (up to 8×). A new fetch replaces the kept tiles.
        Kept now:
        <span data-testid="basemap-kept"
          >${basemap.keptTiles === null ? 'unknown' : count(basemap.keptTiles)}</span
        >
        tiles.
      </p>
      <div class="zooms">
        ${this.zoomPick('From zoom', 'basemap-zmin', this.zMin, (z) => (this.zMin = z))}
        ${this.zoomPick('to zoom', 'basemap-zmax', this.zMax, (z) => (this.zMax = z))}
      </div>
      ${
        est
          ? html`<p data-testid="basemap-estimate">
              ${count(est.count)} tiles, about ${mb(est.bytes)} (at 25 kB a tile, a rough figure)
            </p>`
          : html`<p class="hint" data-testid="basemap-fetch-why">${why}</p>`
      }
      ${est?.refused ? html`<p class="error" role="alert" data-testid="basemap-limit">${est.refused}.</p>` : nothing}
      ${
        running
          ? html`<button data-testid="basemap-cancel" @click=${() => this.abort?.abort()}>
              Cancel
            </button>`
          : html`<button
              data-testid="basemap-fetch"
              ?disabled=${!est || est.refused !== ''}
              @click=${() => void this.start()}
            >
              Fetch and keep ${est && !est.refused ? count(est.count) : ''} tiles
            </button>`
      }
      ${this.progress ? this.renderProgress(this.progress) : nothing}
    `;
  }

  render() {
    if (!this.store) return html``;
    return html`${this.renderArchive()}${this.renderFetch()}`;
  }
}
