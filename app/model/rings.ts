/**
 * Shapes on the ground shared by the map, the exports and the brief: ellipse and circle rings and
 * points along the carrier track, laid out in a local azimuthal equidistant frame so distances and
 * azimuths from the centre are geodesic (see geodesy.ts).
 */
import { destination, LocalFrame, type LatLon } from './geodesy';

const DEG = Math.PI / 180;

/**
 * Closed ring (first vertex repeated last) of n vertices on an ellipse about center: semi-axes in
 * metres, major axis along azimuth_deg clockwise from true north. Vertex k sits at parameter
 * angle 2πk/n from the major-axis end toward azimuth + 90°.
 */
export function ellipseRingLatLon(
  center: LatLon,
  semiMajor_m: number,
  semiMinor_m: number,
  azimuth_deg: number,
  n = 72,
): LatLon[] {
  const frame = new LocalFrame(center);
  const count = Math.max(3, Math.round(n));
  const s = Math.sin(azimuth_deg * DEG);
  const c = Math.cos(azimuth_deg * DEG);
  const ring: LatLon[] = [];
  for (let k = 0; k < count; k++) {
    const t = (2 * Math.PI * k) / count;
    const u = semiMajor_m * Math.cos(t);
    const v = semiMinor_m * Math.sin(t);
    ring.push(frame.toLatLon(u * s + v * c, u * c - v * s));
  }
  ring.push({ ...ring[0] });
  return ring;
}

/** Point s_m metres along the straight track through release at trackDeg (negative: behind it). */
export function alongTrack(release: LatLon, trackDeg: number, s_m: number): LatLon {
  return s_m >= 0
    ? destination(release, trackDeg, s_m)
    : destination(release, trackDeg + 180, -s_m);
}
