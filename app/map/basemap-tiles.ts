/**
 * Web Mercator tile numbering ("slippy map" z/x/y, y counted from the north; the scheme of the
 * OpenStreetMap tile servers and of PMTiles v3): which tiles cover an area at a range of zooms.
 */

/** An area in degrees (WGS 84). */
export interface TileArea {
  south: number;
  west: number;
  north: number;
  east: number;
}

/** Web Mercator's latitude limit, degrees: atan(sinh(π)) (the square world). */
export const MAX_MERCATOR_LAT = 85.0511287798066;

/** Tile column of longitude `lon` (degrees) at zoom `z`. */
export function tileX(lon: number, z: number): number {
  const n = 2 ** z;
  return Math.min(n - 1, Math.max(0, Math.floor(((lon + 180) / 360) * n)));
}

/** Tile row of latitude `lat` (degrees) at zoom `z` (row 0 at the north edge). */
export function tileY(lat: number, z: number): number {
  const n = 2 ** z;
  const phi = (Math.max(-MAX_MERCATOR_LAT, Math.min(MAX_MERCATOR_LAT, lat)) * Math.PI) / 180;
  const y = ((1 - Math.log(Math.tan(phi) + 1 / Math.cos(phi)) / Math.PI) / 2) * n;
  return Math.min(n - 1, Math.max(0, Math.floor(y)));
}

/** The tile ranges (inclusive) covering `area` at zoom `z`. */
export function tileRange(
  area: TileArea,
  z: number,
): { z: number; x0: number; x1: number; y0: number; y1: number } {
  return {
    z,
    x0: tileX(area.west, z),
    x1: tileX(area.east, z),
    y0: tileY(area.north, z),
    y1: tileY(area.south, z),
  };
}

/** How many tiles cover `area` at every zoom from `zMin` to `zMax`. */
export function tileCount(area: TileArea, zMin: number, zMax: number): number {
  let n = 0;
  for (let z = zMin; z <= zMax; z++) {
    const r = tileRange(area, z);
    n += (r.x1 - r.x0 + 1) * (r.y1 - r.y0 + 1);
  }
  return n;
}

/** The tiles covering `area` from `zMin` to `zMax`, coarse zooms first. */
export function* tilesOf(
  area: TileArea,
  zMin: number,
  zMax: number,
): Generator<{ z: number; x: number; y: number }> {
  for (let z = zMin; z <= zMax; z++) {
    const r = tileRange(area, z);
    for (let y = r.y0; y <= r.y1; y++) for (let x = r.x0; x <= r.x1; x++) yield { z, x, y };
  }
}

/** The URL of tile z/x/y from a template with {z} {x} {y} (and Leaflet's {s} → a, {r} → ''). */
export function tileUrlOf(template: string, z: number, x: number, y: number): string {
  return template
    .replace(/\{z\}/g, String(z))
    .replace(/\{x\}/g, String(x))
    .replace(/\{y\}/g, String(y))
    .replace(/\{s\}/g, 'a')
    .replace(/\{r\}/g, '');
}
