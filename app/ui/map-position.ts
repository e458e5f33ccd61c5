/** Plan points on the map: where a plan path's point is drawn; a dropped point in plan degrees. */
import type L from 'leaflet';
import { getAt } from './paths';
import type { PlanStore } from './plan-store';

/** The value when it is a finite number, else null. */
export const finite = (v: unknown): number | null =>
  typeof v === 'number' && Number.isFinite(v) ? v : null;

/**
 * Position at a plan path (`release`, `sites[3]`): the draft's, unless its lat or lon has a
 * problem (out of range, unreadable), then the last valid plan's so nothing jumps off the map.
 */
export function shownPosition(store: PlanStore, path: string): { lat: number; lon: number } | null {
  const bad = store.messageAt(`${path}.lat`) || store.messageAt(`${path}.lon`);
  const src: unknown = bad ? store.plan : store.draft;
  const lat = finite(getAt(src, `${path}.lat`));
  const lon = finite(getAt(src, `${path}.lon`));
  return lat === null || lon === null ? null : { lat, lon };
}

/** A point on the map as the plan stores it: degrees rounded to 7 decimals (about 1 cm). */
export function planLatLon(p: L.LatLng): { lat: number; lon: number } {
  return { lat: +p.lat.toFixed(7), lon: +p.lng.toFixed(7) };
}

/** Moves the point at a plan path to where its marker is while it is dragged (no undo step yet). */
export function dragPointTo(store: PlanStore, path: string, p: L.LatLng): void {
  const cur = (store.get(path) as Record<string, unknown>) ?? {};
  store.edit(path, { ...cur, ...planLatLon(p) }, { transient: true });
}
