/**
 * The map's toolbar: add-sites and draw-zone buttons, switches for the hazard area, the terrain
 * (with an elevation model), the base map (with one set), each layer kind and each variant.
 */
import { css, html, type TemplateResult } from 'lit';
import { styleMap } from 'lit/directives/style-map.js';
import { type LayerVisibility, SHAPE_KINDS, type ShapeKind } from '../map';
import type { Variant } from '../plan';
import { VARIANT_COLOURS } from './shared-styles';
import type { ZoneDrawing } from './zone-drawing';

const KIND_LABEL: Record<ShapeKind, string> = {
  reach: 'Reach areas',
  landing: 'Uncontrolled landings',
  ellipse50: '50 % ellipses',
  ellipse95: '95 % ellipses',
  window: 'Release windows',
  zone: 'Hover zones',
};

/** What the bar shows and what its controls change. */
export interface LayerBarView {
  adding: boolean;
  drawing: ZoneDrawing;
  showHazard: boolean;
  /** The terrain switch, or null when no elevation model is loaded (no switch shown). */
  terrain: boolean | null;
  /** The base map switch, or null when there is no base map (no switch shown). */
  basemap: boolean | null;
  vis: LayerVisibility;
  variants: readonly Partial<Variant>[];
  toggleAdding(): void;
  toggleDrawing(): void;
  setHazard(on: boolean): void;
  setTerrain(on: boolean): void;
  setBasemap(on: boolean): void;
  /** Replaces the visibility by `change` of the current one. */
  changeVis(change: (vis: LayerVisibility) => LayerVisibility): void;
}

const checked = (e: Event): boolean => (e.target as HTMLInputElement).checked;

/** The bar's look, for the styles of the component that renders it. */
export const layerBarStyles = css`
  .bar {
    display: flex;
    flex-wrap: wrap;
    gap: 4px 12px;
    align-items: center;
    padding: 4px 8px;
    background: var(--sf-panel);
    border-bottom: 1px solid var(--sf-line);
    font-size: 13px;
  }
  .bar label {
    display: inline-flex;
    gap: 4px;
    align-items: center;
    white-space: nowrap;
  }
  .swatch {
    width: 10px;
    height: 10px;
    border-radius: 2px;
    display: inline-block;
  }
  .adding {
    background: #0f766e;
    color: #fff;
    border-color: #0f766e;
  }
`;

/** The toolbar above the map (role toolbar, "Map layers"). */
export function layerBar(v: LayerBarView): TemplateResult {
  const { vis, drawing } = v;
  return html`
    <div class="bar" role="toolbar" aria-label="Map layers">
      <button
        class=${v.adding ? 'adding' : ''}
        aria-pressed=${v.adding ? 'true' : 'false'}
        @click=${() => v.toggleAdding()}
      >
        ${v.adding ? 'Adding sites: click the map' : 'Add sites by clicking'}
      </button>
      <button
        class=${drawing.active ? 'adding' : ''}
        aria-pressed=${drawing.active ? 'true' : 'false'}
        @click=${() => v.toggleDrawing()}
      >
        ${drawing.buttonText}
      </button>
      ${drawing.active ? html`<button @click=${() => drawing.cancel()}>Cancel</button>` : ''}
      <label
        ><input
          type="checkbox"
          data-kind="hazard"
          .checked=${v.showHazard}
          @change=${(e: Event) => v.setHazard(checked(e))}
        />Hazard area</label
      >
      ${
        v.terrain === null
          ? ''
          : html`<label title="Hillshade and contour lines of the elevation model"
              ><input
                type="checkbox"
                data-kind="terrain"
                .checked=${v.terrain}
                @change=${(e: Event) => v.setTerrain(checked(e))}
              />Terrain</label
            >`
      }
      ${
        v.basemap === null
          ? ''
          : html`<label title="The base map: a PMTiles archive or the tile URL's tiles"
              ><input
                type="checkbox"
                data-kind="basemap"
                .checked=${v.basemap}
                @change=${(e: Event) => v.setBasemap(checked(e))}
              />Base map</label
            >`
      }
      ${SHAPE_KINDS.map(
        (k) =>
          html`<label
            ><input
              type="checkbox"
              data-kind=${k}
              .checked=${vis.kinds[k]}
              @change=${(e: Event) =>
                v.changeVis((o) => ({ ...o, kinds: { ...o.kinds, [k]: checked(e) } }))}
            />${KIND_LABEL[k]}</label
          >`,
      )}
      <label
        ><input
          type="checkbox"
          data-kind="chosen-only"
          .checked=${vis.chosenOnly}
          @change=${(e: Event) => v.changeVis((o) => ({ ...o, chosenOnly: checked(e) }))}
        />Chosen variant only</label
      >
      ${v.variants.map(
        (variant, i) =>
          html`<label
            title=${vis.chosenOnly ? 'Clear “Chosen variant only” to compare variants' : ''}
            ><input
              type="checkbox"
              data-variant=${String(variant.id)}
              ?disabled=${vis.chosenOnly}
              .checked=${vis.variants[String(variant.id)] !== false}
              @change=${(e: Event) =>
                v.changeVis((o) => ({
                  ...o,
                  variants: { ...o.variants, [String(variant.id)]: checked(e) },
                }))}
            /><span
              class="swatch"
              style=${styleMap({ background: VARIANT_COLOURS[i % VARIANT_COLOURS.length] })}
            ></span
            >${String(variant.id ?? '')}</label
          >`,
      )}
    </div>
  `;
}
