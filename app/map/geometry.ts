/**
 * Map geometry built from core geodesy: rings for ellipses and circles, track segments and
 * handle positions, as [lat, lon] pairs in Leaflet's order. Pure: no Leaflet, no DOM, so the
 * unit tests run it in Node. Also the graticule's interval choice (niceInterval), which lives
 * here because Leaflet cannot be loaded without a window.
 */
import { alongTrack, ellipseRingLatLon, type LatLon } from '../model';

/** A [lat, lon] pair in degrees, Leaflet's order (GeoJSON is the reverse). */
export type LatLngTuple = [number, number];

/**
 * Closed ring (first vertex repeated last) of n vertices on an ellipse around center (degrees):
 * semi-axes in metres, major axis along azimuth_deg clockwise from true north. Vertex k sits at
 * parameter angle 2πk/n from the major axis end towards azimuth_deg + 90°, so for n divisible
 * by 4 vertices 0, n/4, n/2, 3n/4 are the axis ends. Laid out in a LocalFrame (azimuthal
 * equidistant), so each vertex's distance and azimuth from the centre are geodesic.
 */
export function ellipseRing(
  center: LatLon,
  semiMajor_m: number,
  semiMinor_m: number,
  azimuth_deg: number,
  n = 72,
): LatLngTuple[] {
  return ellipseRingLatLon(center, semiMajor_m, semiMinor_m, azimuth_deg, n).map((p) => [
    p.lat,
    p.lon,
  ]);
}

/** Closed ring of n vertices at geodesic distance radius_m (metres) around center (degrees). */
export function circleRing(center: LatLon, radius_m: number, n = 72): LatLngTuple[] {
  return ellipseRing(center, radius_m, radius_m, 0, n);
}

/**
 * Points (n ≥ 2, evenly spaced in time) of a straight track through release (degrees) with true
 * course trackDeg and groundSpeed_mps, from from_s to to_s seconds relative to passing the
 * release point (positive = after it). The track is the geodesic through release with azimuth
 * trackDeg there.
 */
export function trackSegment(
  release: LatLon,
  trackDeg: number,
  groundSpeed_mps: number,
  from_s: number,
  to_s: number,
  n = 2,
): LatLngTuple[] {
  const count = Math.max(2, Math.round(n));
  const points: LatLngTuple[] = [];
  for (let i = 0; i < count; i++) {
    const t_s = from_s + ((to_s - from_s) * i) / (count - 1);
    const p = alongTrack(release, trackDeg, groundSpeed_mps * t_s);
    points.push([p.lat, p.lon]);
  }
  return points;
}

/**
 * The points of a line (degrees) moved offset_m metres sideways, to the right of trackDeg when
 * positive and to the left when negative: a lane beside a track.
 */
export function offsetLine(
  line: readonly LatLngTuple[],
  trackDeg: number,
  offset_m: number,
): LatLngTuple[] {
  return line.map(([lat, lon]) => {
    const p = alongTrack({ lat, lon }, trackDeg + 90, offset_m);
    return [p.lat, p.lon];
  });
}

/** Position of a drag handle distance_m metres ahead of release (degrees) along trackDeg. */
export function bearingHandle(release: LatLon, trackDeg: number, distance_m: number): LatLngTuple {
  const p = alongTrack(release, trackDeg, distance_m);
  return [p.lat, p.lon];
}

// Graticule steps of 10° and more: divisors of 90 so the equator and poles stay on lines.
const LARGE_STEPS_DEG = [10, 15, 30, 45, 90];

/**
 * A "nice" grid interval in degrees for a view spanning spanDeg degrees, so that about
 * targetLines lines cross it: the step nearest spanDeg / targetLines (in ratio) from
 * 1-2-5 × 10^k below 10°, then 10, 15, 30, 45, 90. Neighbouring steps differ by at most 2.5×,
 * so with the default target √40 ≈ 6.3 the span holds between 4 and 10 steps. NaN when
 * spanDeg or targetLines is not a positive finite number.
 */
export function niceInterval(spanDeg: number, targetLines = Math.sqrt(40)): number {
  if (!(spanDeg > 0 && Number.isFinite(spanDeg) && targetLines > 0 && Number.isFinite(targetLines)))
    return NaN;
  const ideal = spanDeg / targetLines;
  const candidates: number[] = [];
  if (ideal < 10) {
    const e = Math.floor(Math.log10(ideal));
    for (const m of [1, 2, 5, 10]) {
      // Dividing by a power of ten keeps 0.0005 exact-as-printed, unlike 5 * 1e-4.
      candidates.push(e < 0 ? m / 10 ** -e : m * 10 ** e);
    }
  }
  candidates.push(...LARGE_STEPS_DEG);
  let best = candidates[0];
  for (const c of candidates) {
    if (Math.abs(Math.log(c / ideal)) < Math.abs(Math.log(best / ideal))) best = c;
  }
  return best;
}

/** Decimals needed to print multiples of step exactly: 0.0005 → 4, 0.2 → 1, 15 → 0. */
export function intervalDecimals(step: number): number {
  if (!(step > 0 && Number.isFinite(step))) return 0;
  for (let d = 0; d < 12; d++) {
    if (Math.abs(Math.round(step * 10 ** d) - step * 10 ** d) < 1e-9 * 10 ** d) return d;
  }
  return 12;
}
