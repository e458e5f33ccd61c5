import { describe, expect, it } from 'vitest';
import fc from 'fast-check';
import { Geodesic } from 'geographiclib-geodesic';
import {
  bearingHandle,
  circleRing,
  ellipseRing,
  intervalDecimals,
  niceInterval,
  trackSegment,
} from '../../app/map/geometry';
import { expectClose } from './helpers';

// Reference: GeographicLib (Karney 2013), npm geographiclib-geodesic, WGS84; accurate to ~15 nm.
const ref = Geodesic.WGS84;

function inverse(a: { lat: number; lon: number }, b: [number, number]) {
  const r = ref.Inverse(a.lat, a.lon, b[0], b[1]);
  return { s_m: r.s12 as number, azi_deg: r.azi1 as number };
}

/** Signed difference of two angles in degrees, wrapped into (−180, 180]. */
function angleDiff(a: number, b: number): number {
  return ((((a - b) % 360) + 540) % 360) - 180;
}

const centres = [
  { name: 'mid-latitude', lat: 47.5, lon: 21.1 },
  { name: 'equator on the prime meridian', lat: 0, lon: 0 },
  { name: 'southern high latitude', lat: -62.3, lon: -58.9 },
  { name: 'next to the antimeridian', lat: 12.3, lon: 179.999 },
];

describe('ellipseRing against GeographicLib', () => {
  for (const c of centres) {
    it(`axis ends lie at the semi-axes along the azimuth (1 mm, 0.01°), ${c.name}`, () => {
      for (const [a, b, az] of [
        [1200, 400, 35],
        [5000, 5000, 0],
        [80, 30, 290.5],
        [20000, 3000, 180],
      ]) {
        const ring = ellipseRing(c, a, b, az, 72);
        expect(ring).toHaveLength(73);
        // Vertex k is at parameter angle 5k°: 0 and 36 on the major axis, 18 and 54 on the minor.
        const ends: [number, number, number][] = [
          [0, a, az],
          [18, b, az + 90],
          [36, a, az + 180],
          [54, b, az + 270],
        ];
        for (const [k, s, dir] of ends) {
          const r = inverse(c, ring[k]);
          expectClose(r.s_m, s, 1e-3, `vertex ${k} distance, a ${a} b ${b} az ${az}`);
          expect(Math.abs(angleDiff(r.azi_deg, dir)), `vertex ${k} azimuth`).toBeLessThanOrEqual(
            0.01,
          );
        }
      }
    });
  }

  // Parametric ellipse (common practice): in the local plane every vertex satisfies
  // (u/a)² + (v/b)² = 1; checked through geodesic distance and azimuth from the centre.
  it('every vertex lies on the ellipse (distance within 1 mm of the polar radius)', () => {
    fc.assert(
      fc.property(
        fc.double({ min: -70, max: 70, noNaN: true }),
        fc.double({ min: -180, max: 180, noNaN: true }),
        fc.double({ min: 10, max: 10000, noNaN: true }),
        fc.double({ min: 0.1, max: 1, noNaN: true }),
        fc.double({ min: 0, max: 360, noNaN: true }),
        (lat, lon, a, ratio, az) => {
          const b = a * ratio;
          const c = { lat, lon };
          for (const v of ellipseRing(c, a, b, az, 24).slice(0, -1)) {
            const r = inverse(c, v);
            const th = (angleDiff(r.azi_deg, az) * Math.PI) / 180;
            const expected = (a * b) / Math.hypot(b * Math.cos(th), a * Math.sin(th));
            expectClose(r.s_m, expected, 1e-3);
          }
        },
      ),
      { numRuns: 100 },
    );
  });

  it('the ring is closed: the last vertex repeats the first exactly', () => {
    const ring = ellipseRing({ lat: 47.5, lon: 21.1 }, 300, 100, 60);
    expect(ring[ring.length - 1]).toEqual(ring[0]);
    expect(ring[ring.length - 1]).not.toBe(ring[0]);
  });
});

describe('circleRing against GeographicLib', () => {
  for (const c of centres) {
    it(`every vertex is radius_m from the centre within 1 mm, ${c.name}`, () => {
      for (const radius of [25, 500, 8000]) {
        const ring = circleRing(c, radius, 36);
        expect(ring).toHaveLength(37);
        expect(ring[36]).toEqual(ring[0]);
        ring.forEach((v, k) => {
          const r = inverse(c, v);
          expectClose(r.s_m, radius, 1e-3, `vertex ${k}`);
          // Vertex k of n = 36 is at azimuth 10k° (k = 36 closes at 0°).
          expect(Math.abs(angleDiff(r.azi_deg, 10 * k))).toBeLessThanOrEqual(0.01);
        });
      }
    });
  }
});

describe('trackSegment and bearingHandle against GeographicLib', () => {
  for (const c of centres) {
    it(`endpoints are speed × time along the track from the release point, ${c.name}`, () => {
      for (const [track, speed, from, to] of [
        [0, 15, -60, 30],
        [123.4, 22, 0, 120],
        [270, 8.5, -300, -10],
      ]) {
        const seg = trackSegment(c, track, speed, from, to);
        expect(seg).toHaveLength(2);
        for (const [p, t] of [
          [seg[0], from],
          [seg[1], to],
        ] as const) {
          const r = inverse(c, p);
          expectClose(r.s_m, Math.abs(speed * t), 1e-3, `t ${t} s`);
          const dir = t >= 0 ? track : track + 180;
          // At t = 0 the point is the release point itself and has no azimuth.
          if (t !== 0)
            expect(Math.abs(angleDiff(r.azi_deg, dir)), `t ${t} s azimuth`).toBeLessThanOrEqual(
              0.01,
            );
          // GeographicLib Direct gives the same point to within 1 mm.
          const d = ref.Direct(c.lat, c.lon, dir, Math.abs(speed * t));
          expect(ref.Inverse(d.lat2 as number, d.lon2 as number, p[0], p[1]).s12).toBeLessThan(
            1e-3,
          );
        }
      }
    });
  }

  it('intermediate points are evenly spaced in time', () => {
    const c = centres[0];
    const seg = trackSegment(c, 45, 10, -20, 20, 5);
    expect(seg).toHaveLength(5);
    seg.forEach((p, i) => expectClose(inverse(c, p).s_m, Math.abs(-200 + 100 * i), 1e-3));
  });

  it('the bearing handle is distance_m ahead on the track', () => {
    for (const c of centres) {
      const r = inverse(c, bearingHandle(c, 200, 150));
      expectClose(r.s_m, 150, 1e-3);
      expect(Math.abs(angleDiff(r.azi_deg, 200))).toBeLessThanOrEqual(0.01);
    }
  });
});

describe('niceInterval', () => {
  // common practice: grid steps of 1, 2 or 5 × 10^k read easily.
  it('returns 1-2-5 steps below 10° and divisors of 90 above', () => {
    expect(niceInterval(1, 5)).toBe(0.2);
    expect(niceInterval(0.003, 6)).toBe(0.0005);
    expect(niceInterval(0.0004, 4)).toBe(0.0001);
    expect(niceInterval(60, 6)).toBe(10);
    expect(niceInterval(200, 6)).toBe(30);
    expect(niceInterval(5000, 6)).toBe(90);
  });

  it('gives 4 to 10 steps across any span from 1e-6° to 500° with the default target', () => {
    fc.assert(
      fc.property(fc.double({ min: -6, max: Math.log10(500), noNaN: true }), (e) => {
        const span = 10 ** e;
        const steps = span / niceInterval(span);
        expect(steps).toBeGreaterThanOrEqual(4 - 1e-9);
        expect(steps).toBeLessThanOrEqual(10 + 1e-9);
      }),
      { numRuns: 2000 },
    );
  });

  it('is NaN for a span that is not positive and finite', () => {
    for (const s of [0, -1, NaN, Infinity]) expect(niceInterval(s)).toBeNaN();
  });

  it('knows the decimals that print multiples of a step exactly', () => {
    expect(intervalDecimals(0.0005)).toBe(4);
    expect(intervalDecimals(0.2)).toBe(1);
    expect(intervalDecimals(0.01)).toBe(2);
    expect(intervalDecimals(15)).toBe(0);
    expect(intervalDecimals(niceInterval(0.00002))).toBe(6);
  });
});
