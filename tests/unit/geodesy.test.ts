import { describe, expect, it } from 'vitest';
import fc from 'fast-check';
import { Geodesic } from 'geographiclib-geodesic';
import { LocalFrame, bearingDeg, destination, distance_m } from '../../app/model/geodesy';

// Reference: GeographicLib (Karney 2013), npm geographiclib-geodesic, WGS84; accurate to ~15 nm.
const ref = Geodesic.WGS84;

/** Signed difference of two angles in degrees, wrapped into (−180, 180]. */
function angleDiff(a: number, b: number): number {
  const d = (((a - b) % 360) + 540) % 360;
  return d - 180;
}

function expectClose(actual: number, expected: number, tol: number, what = ''): void {
  expect(
    Math.abs(actual - expected),
    `${what} actual ${actual} expected ${expected}`,
  ).toBeLessThanOrEqual(tol);
}

const centres = [
  { name: 'equator', lat: 0, lon: 0 },
  { name: '45°N', lat: 45, lon: 7.5 },
  { name: '60°S', lat: -60, lon: -68.25 },
  { name: 'near the antimeridian (north)', lat: 12.3, lon: 179.995 },
  { name: 'near the antimeridian (south)', lat: -41.2, lon: -179.99 },
];
const distances = [10, 100, 1000, 5000, 20000];
const azimuths = [0, 37, 90, 135.5, 180, 222, 270, 333];

describe('LocalFrame against GeographicLib (Geodesic.WGS84)', () => {
  for (const c of centres) {
    it(`distance and azimuth from the centre are geodesic within 1 mm, 10 m to 20 km, centre ${c.name}`, () => {
      const frame = new LocalFrame(c);
      for (const s of distances) {
        for (const az of azimuths) {
          const end = ref.Direct(c.lat, c.lon, az, s);
          const lat2 = end.lat2 as number;
          const lon2 = end.lon2 as number;
          const inv = ref.Inverse(c.lat, c.lon, lat2, lon2);
          const { x, y } = frame.toLocal({ lat: lat2, lon: lon2 });
          expectClose(Math.hypot(x, y), inv.s12 as number, 1e-3, `s ${s} az ${az}`);
          // 1 mm sideways at distance s.
          const azErrRad =
            (angleDiff((Math.atan2(x, y) * 180) / Math.PI, inv.azi1 as number) * Math.PI) / 180;
          expect(Math.abs(azErrRad) * s).toBeLessThanOrEqual(1e-3);

          expectClose(distance_m(c, { lat: lat2, lon: lon2 }), inv.s12 as number, 1e-3);
          expect(
            Math.abs(angleDiff(bearingDeg(c, { lat: lat2, lon: lon2 }), az)) * (Math.PI / 180) * s,
          ).toBeLessThanOrEqual(1e-3);

          const back = frame.toLatLon(x, y);
          expect(ref.Inverse(back.lat, back.lon, lat2, lon2).s12 as number).toBeLessThanOrEqual(
            1e-3,
          );
          const dest = destination(c, az, s);
          expect(ref.Inverse(dest.lat, dest.lon, lat2, lon2).s12 as number).toBeLessThanOrEqual(
            1e-3,
          );
          expect(dest.lon).toBeGreaterThanOrEqual(-180);
          expect(dest.lon).toBeLessThan(180);
        }
      }
    });
  }

  it('maps the centre to the origin and points beside it smoothly (no snap at lon 0)', () => {
    const frame = new LocalFrame({ lat: 0, lon: 0 });
    expect(frame.toLocal({ lat: 0, lon: 0 })).toEqual({ x: 0, y: 0 });
    // 3e-9° ≈ 0.33 mm: proj4's aeqd alone would snap this to (0, 0).
    const p = frame.toLocal({ lat: 3e-9, lon: 3e-9 });
    const inv = ref.Inverse(0, 0, 3e-9, 3e-9);
    // 10 nm: GeographicLib's own round-off is ~15 nm (Karney 2013).
    expectClose(Math.hypot(p.x, p.y), inv.s12 as number, 1e-8);
  });

  it('round-trips toLocal → toLatLon within 1e-9° (property)', () => {
    fc.assert(
      fc.property(
        fc.double({ min: -85, max: 85, noNaN: true }),
        fc.double({ min: -180, max: 180, noNaN: true }),
        fc.double({ min: -0.2, max: 0.2, noNaN: true }),
        fc.double({ min: -0.2, max: 0.2, noNaN: true }),
        (lat, lon, dLat, dLon) => {
          const frame = new LocalFrame({ lat, lon });
          const p = { lat: Math.max(-89.9, Math.min(89.9, lat + dLat)), lon: lon + dLon };
          const { x, y } = frame.toLocal(p);
          const q = frame.toLatLon(x, y);
          expect(Math.abs(q.lat - p.lat)).toBeLessThanOrEqual(1e-9);
          expect(Math.abs(angleDiff(q.lon, p.lon))).toBeLessThanOrEqual(1e-9);
        },
      ),
      { numRuns: 2000 },
    );
  });
});

describe('published long lines', () => {
  // Karney 2013, "Algorithms for geodesics", J. Geodesy 87:43, worked example (WGS84).
  it('geographiclib reproduces the Karney 2013 nearly antipodal example', () => {
    const r = ref.Inverse(-30, 0, 29.9, 179.8);
    expectClose(r.s12 as number, 19989832.82761, 1e-5);
    expectClose(r.azi1 as number, 161.89052473633, 1e-10);
    expectClose(r.azi2 as number, 18.09073724574, 1e-10);
  });

  // Karney 2013 example: Vincenty's inverse (inside proj4's aeqd) does not converge this close
  // to antipodal; distance_m documents NaN there. Seedfall never needs lines this long.
  it('distance_m returns NaN rather than a wrong number on the Karney 2013 antipodal line', () => {
    expect(distance_m({ lat: -30, lon: 0 }, { lat: 29.9, lon: 179.8 })).toBeNaN();
  });

  // GeographicLib documentation, geodesic inverse example JFK → LHR (WGS84).
  it('geographiclib reproduces the GeographicLib documented example (40.6, −73.8) → (51.6, −0.5)', () => {
    const r = ref.Inverse(40.6, -73.8, 51.6, -0.5);
    expectClose(r.s12 as number, 5551759.400319, 1e-6);
    expectClose(r.azi1 as number, 51.198883, 1e-6);
    expectClose(r.azi2 as number, 107.821777, 1e-6);
  });

  // GeographicLib documentation example; Vincenty's stated accuracy is ~0.1 mm, we allow 1 mm.
  it('distance_m and bearingDeg match the GeographicLib documented example within 1 mm and 1e-6°', () => {
    const a = { lat: 40.6, lon: -73.8 };
    const b = { lat: 51.6, lon: -0.5 };
    expectClose(distance_m(a, b), 5551759.400319, 1e-3);
    expectClose(bearingDeg(a, b), 51.198883, 1e-6);
  });

  it('bearingDeg is 0 for coincident points and stays in [0, 360)', () => {
    expect(bearingDeg({ lat: 10, lon: 20 }, { lat: 10, lon: 20 })).toBe(0);
    const west = bearingDeg({ lat: 10, lon: 20 }, { lat: 10, lon: 19.9 });
    expect(west).toBeGreaterThan(269);
    expect(west).toBeLessThan(271);
  });
});
