// The no-drop zones section of <sf-safety-panel>: the zones listed, renamed, deleted or opened.
import { html } from 'lit';
import type { NoDropZone } from '../plan';
import type { PlanStore } from './plan-store';
import { deleteRowButton } from './delete-row-button';
import { takePickedFile } from './picked-file';

/** Corners of a stored zone's outer ring (0 when the zone has no ring to count). */
function corners(z: Partial<NoDropZone>): number {
  const ring = (z.geometry as { coordinates?: unknown } | undefined)?.coordinates;
  return Array.isArray(ring) && Array.isArray(ring[0]) ? Math.max(0, ring[0].length - 1) : 0;
}

/**
 * The polygons of a GeoJSON value as zones (a MultiPolygon gives one zone per part, named after
 * the feature with a number), and the features skipped because they are not polygons.
 */
function zonesOf(data: unknown, fileName: string): { zones: NoDropZone[]; skipped: string[] } {
  const obj = (v: unknown): Record<string, unknown> =>
    v !== null && typeof v === 'object' && !Array.isArray(v) ? (v as Record<string, unknown>) : {};
  const top = obj(data);
  const feats: unknown[] =
    top.type === 'FeatureCollection' ? (Array.isArray(top.features) ? top.features : []) : [data];
  const zones: NoDropZone[] = [];
  const skipped: string[] = [];
  feats.forEach((f, i) => {
    const g = (obj(f).geometry ?? obj(f)) as {
      type?: unknown;
      coordinates?: number[][][] | number[][][][];
    };
    const pname = obj(obj(f).properties).name;
    const name = typeof pname === 'string' ? pname : `${fileName} ${i + 1}`;
    if (g?.type === 'Polygon')
      zones.push({
        type: 'Feature',
        properties: { name },
        geometry: { type: 'Polygon', coordinates: g.coordinates as number[][][] },
      });
    else if (g?.type === 'MultiPolygon' && Array.isArray(g.coordinates)) {
      (g.coordinates as number[][][][]).forEach((c, k) =>
        zones.push({
          type: 'Feature',
          properties: { name: `${name} ${k + 1}` },
          geometry: { type: 'Polygon', coordinates: c },
        }),
      );
    } else skipped.push(`features[${i}] (${typeof g?.type === 'string' ? g.type : 'no geometry'})`);
  });
  return { zones, skipped };
}

/** Adds the polygons of the GeoJSON file picked in the section's input to the plan's zones. */
async function importZones(s: PlanStore, e: Event): Promise<void> {
  const file = takePickedFile(e);
  if (!file) return;
  let data: unknown;
  try {
    data = JSON.parse(await file.text());
  } catch {
    s.setNotice('error', `${file.name}: not JSON; no zones added.`);
    return;
  }
  const { zones, skipped } = zonesOf(data, file.name);
  const cur = s.list('safety.noDropZones');
  s.edit('safety.noDropZones', [...cur, ...zones]);
  s.setNotice(
    skipped.length ? 'error' : 'info',
    `${file.name}: ${zones.length} zone(s) added${skipped.length ? `; not polygons, skipped: ${skipped.join(', ')}` : ''}.`,
  );
}

/** The zones with their names, corner counts and delete buttons, and the GeoJSON file input. */
export function noDropZones(s: PlanStore) {
  const zones = s.rows<NoDropZone>('safety.noDropZones');
  return html`<h3>No-drop zones (${zones.length})</h3>
    <p class="muted">
      Roads, buildings, water, gatherings: nothing may land within the buffer of these. Draw them on
      the map (“Draw no-drop zone”) or open a GeoJSON file of polygons.
    </p>
    ${zones.map(
      (z, i) =>
        html`<div class="row" data-zone=${i}>
          <input
            aria-label=${`No-drop zone ${i + 1} name`}
            .value=${String(z.properties?.name ?? '')}
            @change=${(e: Event) => s.edit(`safety.noDropZones[${i}].properties`, { name: (e.target as HTMLInputElement).value })}
          />
          <span class="muted">${corners(z)} corners</span>
          ${deleteRowButton(s, 'safety.noDropZones', i, `Delete no-drop zone ${i + 1}`)}
        </div>`,
    )}
    <div class="row">
      <label
        >Open GeoJSON polygons
        <input
          type="file"
          accept=".geojson,.json,application/geo+json"
          data-testid="zones-file"
          @change=${(e: Event) => importZones(s, e)}
        />
      </label>
    </div>`;
}
