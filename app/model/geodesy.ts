/**
 * A local metric frame around a centre point, and geodesic distance, bearing and
 * destination built on it.
 *
 * The frame is proj4's ellipsoidal azimuthal equidistant projection on WGS84. Away from the
 * poles proj4 evaluates it with Vincenty's (1975) inverse and direct formulae, so the distance
 * and azimuth of any point *from the centre* are geodesic (Vincenty: ~0.1 mm). Distances
 * between two non-centre points in the plane are not geodesic; the error grows with the
 * square of the distance from the centre, so keep frames to the size of one plan.
 *
 * NaN behaviour: Vincenty's inverse does not converge for nearly antipodal points (roughly
 * beyond 19 900 km); `toLocal`, `distance_m` and `bearingDeg` then return NaN. A planner never
 * needs such lines.
 */
import proj4 from 'proj4';
import { WGS84_A, WGS84_F } from './constants';

/** A WGS84 position in degrees. */
export interface LatLon {
  lat: number;
  lon: number;
}

/** A position in a local frame, metres: x east, y north of the centre. */
export interface LocalXY {
  x: number;
  y: number;
}

const DEG = Math.PI / 180;
const E2 = WGS84_F * (2 - WGS84_F);
// Below this offset (degrees, ≈ 0.1 m) toLocal uses the tangent plane; see toLocal.
const NEAR_CENTRE_DEG = 1e-6;

/** Wrap a longitude in degrees into [-180, 180). */
export function normalizeLon(lonDeg: number): number {
  const l = (((lonDeg + 180) % 360) + 360) % 360;
  return l - 180;
}

/** Wrap an angle in degrees into [0, 360). */
export function normalizeDeg360(deg: number): number {
  const d = ((deg % 360) + 360) % 360;
  // (-1e-15 % 360) + 360 rounds to 360 exactly.
  return d === 360 ? 0 : d;
}

/** Azimuthal equidistant metric frame (x east, y north, metres) centred on a WGS84 point. */
export class LocalFrame {
  readonly center: Readonly<LatLon>;
  private readonly converter: proj4.Converter;
  // Radii of curvature at the centre (meridian M, prime vertical N·cosφ), m per radian.
  private readonly mPerRadLat: number;
  private readonly mPerRadLon: number;

  /** @param center frame origin, WGS84 degrees */
  constructor(center: LatLon) {
    this.center = { lat: center.lat, lon: center.lon };
    this.converter = proj4(
      'WGS84',
      `+proj=aeqd +lat_0=${center.lat} +lon_0=${center.lon} +ellps=WGS84 +units=m +no_defs`,
    );
    // Meridian and prime-vertical radii of curvature, standard formulae (Snyder 1987 §4; from memory).
    const s = Math.sin(center.lat * DEG);
    const w = Math.sqrt(1 - E2 * s * s);
    this.mPerRadLat = (WGS84_A * (1 - E2)) / (w * w * w);
    this.mPerRadLon = (WGS84_A / w) * Math.cos(center.lat * DEG);
  }

  /** WGS84 degrees → local metres (x east, y north). */
  toLocal(p: LatLon): LocalXY {
    // proj4's aeqd snaps points within 1e-10 rad of the centre to (0, 0) when the centre lies
    // on lon 0 (it tests |lon| rather than |lon − lon_0|): up to 0.6 mm and 6e-9° off. Within
    // 0.1 m of the centre the tangent plane is good to 1e-8 m (below 85° lat), so use it there.
    const dLat = p.lat - this.center.lat;
    const dLon = normalizeLon(p.lon - this.center.lon);
    if (Math.abs(dLat) < NEAR_CENTRE_DEG && Math.abs(dLon) < NEAR_CENTRE_DEG) {
      return { x: dLon * DEG * this.mPerRadLon, y: dLat * DEG * this.mPerRadLat };
    }
    const r = this.converter.forward({ x: p.lon, y: p.lat });
    return { x: r.x, y: r.y };
  }

  /** Local metres (x east, y north) → WGS84 degrees, longitude in [-180, 180). */
  toLatLon(x: number, y: number): LatLon {
    const r = this.converter.inverse({ x, y });
    return { lat: r.y, lon: normalizeLon(r.x) };
  }
}

// One-entry memo: callers tend to ask many distances from the same point in a row, and
// building a proj4 converter costs ~20 µs against ~0.4 µs per projected point.
let lastFrame: LocalFrame | undefined;
function frameAt(p: LatLon): LocalFrame {
  if (!lastFrame || lastFrame.center.lat !== p.lat || lastFrame.center.lon !== p.lon) {
    lastFrame = new LocalFrame(p);
  }
  return lastFrame;
}

/** Geodesic distance in metres between two WGS84 points (degrees); NaN if nearly antipodal. */
export function distance_m(a: LatLon, b: LatLon): number {
  const { x, y } = frameAt(a).toLocal(b);
  return Math.hypot(x, y);
}

/** Initial true bearing in degrees [0, 360) of the geodesic from a to b; 0 when a equals b. */
export function bearingDeg(a: LatLon, b: LatLon): number {
  const { x, y } = frameAt(a).toLocal(b);
  if (x === 0 && y === 0) return 0;
  return normalizeDeg360(Math.atan2(x, y) / DEG);
}

/** Point reached from p (degrees) along the geodesic with initial true bearing bearing_deg for distance_m metres. */
export function destination(p: LatLon, bearing_deg: number, distance_m: number): LatLon {
  const t = bearing_deg * DEG;
  return frameAt(p).toLatLon(distance_m * Math.sin(t), distance_m * Math.cos(t));
}
