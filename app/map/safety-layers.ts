/** Safety as Leaflet layers: the hazard area, the plan's no-drop zones, a zone being drawn. */
import L from 'leaflet';
import type { PlanSafety } from '../safety';
import { tipNode } from './tooltip';

const num = (v: unknown): number | null => (typeof v === 'number' && Number.isFinite(v) ? v : null);

/** Leaflet rings of a stored polygon's [lon, lat] coordinates, or null when they are not that. */
function zoneRings(c: unknown): L.LatLngTuple[][] | null {
  if (!Array.isArray(c) || c.length === 0) return null;
  const rings: L.LatLngTuple[][] = [];
  for (const ring of c) {
    if (!Array.isArray(ring)) return null;
    const pts: L.LatLngTuple[] = [];
    for (const p of ring) {
      const [lon, lat] = Array.isArray(p) ? [num(p[0]), num(p[1])] : [null, null];
      if (lon === null || lat === null) return null;
      pts.push([lat, lon]);
    }
    rings.push(pts);
  }
  return rings;
}

/** The hazard area's polygons (class `sf-hazard`), each with its size and how it was made. */
function hazardLayers(safety: PlanSafety, group: L.LayerGroup): void {
  const hz = safety.hazardArea;
  const polys =
    hz.geometry.type === 'Polygon' ? [hz.geometry.coordinates] : hz.geometry.coordinates;
  for (const p of polys) {
    L.polygon(
      p.map((ring) => ring.map(([lon, lat]) => [lat, lon] as L.LatLngTuple)),
      {
        color: '#b42318',
        weight: 2,
        dashArray: '10 4 2 4',
        fillOpacity: 0.05,
        className: 'sf-hazard',
      },
    )
      .bindTooltip(
        tipNode([
          'Hazard area — keep people clear',
          `${(safety.hazardArea_m2 / 10000).toFixed(2)} ha, ` +
            `99 % landing ellipses swept over the windows plus the ground under the releases, ` +
            `grown by ${safety.settings.hazardBuffer_m} m`,
        ]),
        { sticky: true },
      )
      .addTo(group);
  }
}

/**
 * The hazard area (when `showHazard` and the checks have one) and the no-drop zones, given as
 * stored in the plan (GeoJSON features, unchecked), each zone of class `sf-nodrop`.
 */
export function buildSafetyLayers(
  safety: PlanSafety | null,
  zones: readonly unknown[],
  showHazard: boolean,
): L.LayerGroup {
  const group = L.layerGroup();
  if (safety?.hazardArea && showHazard) hazardLayers(safety, group);
  for (const z of zones as {
    properties?: { name?: unknown };
    geometry?: { coordinates?: unknown };
  }[]) {
    // A zone of the wrong shape is not drawn; validation names it under the Safety tab.
    const rings = zoneRings(z?.geometry?.coordinates);
    if (!rings) continue;
    const tip = tipNode([`No-drop zone: ${String(z.properties?.name ?? '') || 'unnamed'}`]);
    L.polygon(rings, {
      color: '#1c2b27',
      weight: 1.5,
      fillColor: '#1c2b27',
      fillOpacity: 0.18,
      className: 'sf-nodrop',
    })
      .bindTooltip(tip, { sticky: true })
      .addTo(group);
  }
  return group;
}

/** The zone being drawn: a dashed outline through its corners (the caller closes the ring). */
export function drawingOutline(ring: L.LatLng[]): L.Polyline {
  return L.polyline(ring, {
    color: '#1c2b27',
    dashArray: '4 4',
    weight: 2,
    className: 'sf-drawing',
  });
}
