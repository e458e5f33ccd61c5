import { describe, expect, it } from 'vitest';
import fc from 'fast-check';
import proj4 from 'proj4';
import { Geodesic } from 'geographiclib-geodesic';
import {
  formatDMS,
  formatDecimal,
  formatUTM,
  fromMGRS,
  fromUTM,
  parseCoordinate,
  toMGRS,
  toUTM,
  utmBand,
  utmZone,
} from '../../app/model/coords';

// Ground distance between two points, m (GeographicLib, WGS84).
const gap = (a: { lat: number; lon: number }, b: { lat: number; lon: number }): number =>
  Geodesic.WGS84.Inverse(a.lat, a.lon, b.lat, b.lon).s12 as number;

describe('UTM through proj4', () => {
  // Snyder 1987, Map Projections: A Working Manual, USGS PP 1395, pp. 269–270 (Clarke 1866).
  it('reproduces Snyder’s UTM worked example: 40.5°N 73.5°W → x 627106.5, y 4484124.4 within 0.1 m', () => {
    const utm18 = proj4('WGS84', '+proj=utm +zone=18 +ellps=clrk66 +units=m +no_defs');
    const r = utm18.forward({ x: -73.5, y: 40.5 });
    expect(Math.abs(r.x - 627106.5)).toBeLessThanOrEqual(0.1);
    expect(Math.abs(r.y - 4484124.4)).toBeLessThanOrEqual(0.1);
  });

  it('round-trips WGS84 → UTM → WGS84 within 1 mm for |lat| ≤ 80 (property)', () => {
    fc.assert(
      fc.property(
        fc.double({ min: -80, max: 80, noNaN: true }),
        fc.double({ min: -180, max: 179.999999, noNaN: true }),
        (lat, lon) => {
          const p = { lat, lon };
          const u = toUTM(p);
          expect(u.easting).toBeGreaterThan(100000);
          expect(u.easting).toBeLessThan(900000);
          expect(gap(fromUTM(u), p)).toBeLessThanOrEqual(1e-3);
        },
      ),
      { numRuns: 2000 },
    );
  });

  // common practice: UTM zone 32 in southern Norway, zones 31/33/35/37 over Svalbard, band letters C–X.
  it('picks standard zones, the Norway and Svalbard exceptions, and band letters', () => {
    expect(utmZone({ lat: 47.2, lon: 8.05 })).toBe(32);
    expect(utmZone({ lat: 60, lon: 5 })).toBe(32);
    expect(utmZone({ lat: 78, lon: 10 })).toBe(33);
    expect(utmZone({ lat: 0, lon: -180 })).toBe(1);
    expect(utmZone({ lat: 0, lon: 180 })).toBe(60);
    expect(utmBand(47.2)).toBe('T');
    expect(utmBand(-33.9)).toBe('H');
    expect(utmBand(83)).toBe('X');
    expect(utmBand(85)).toBeUndefined();
  });

  // UTM: false easting 500 000 m on the central meridian; false northing 10 000 000 m south (common practice).
  it('puts the central meridian at easting 500 000 m and uses the southern false northing', () => {
    const n = toUTM({ lat: 0.000001, lon: 9 });
    expect(n).toMatchObject({ zone: 32, hemisphere: 'N' });
    expect(Math.abs(n.easting - 500000)).toBeLessThan(1e-6);
    const s = toUTM({ lat: -0.000001, lon: 9 });
    expect(s.hemisphere).toBe('S');
    expect(Math.abs(s.northing - 10000000)).toBeLessThan(1);
  });

  it('formats UTM as zone, band, easting, northing', () => {
    expect(formatUTM({ lat: 47.2, lon: 8.05 })).toMatch(/^32T \d{6} \d{7}$/);
  });
});

describe('MGRS through the mgrs package', () => {
  it('round-trips within 1 m at 1 m precision (property, 80°S–84°N)', () => {
    fc.assert(
      fc.property(
        fc.double({ min: -80, max: 83.9, noNaN: true }),
        fc.double({ min: -180, max: 179.999, noNaN: true }),
        (lat, lon) => {
          const p = { lat, lon };
          // The 1 m square's centre lies within √2/2 m of any point in it.
          expect(gap(fromMGRS(toMGRS(p)), p)).toBeLessThanOrEqual(0.75);
        },
      ),
      { numRuns: 1000 },
    );
  });

  it('agrees with our UTM digits and uses the band letter', () => {
    const p = { lat: 47.2, lon: 8.05 };
    const m = toMGRS(p);
    const u = toUTM(p);
    expect(m.slice(0, 3)).toBe('32T');
    // MGRS truncates to the metre: the last 5+5 digits are easting and northing mod 100 km.
    expect(Number(m.slice(5, 10))).toBe(Math.floor(u.easting) % 100000);
    expect(Number(m.slice(10, 15))).toBe(Math.floor(u.northing) % 100000);
    expect(toMGRS(p, 2)).toBe(`${m.slice(0, 5)}${m.slice(5, 7)}${m.slice(10, 12)}`);
  });
});

describe('formatting', () => {
  // Arithmetic: 12′34.5″ = 12/60 + 34.5/3600 = 0.2095833…°; 3′21″ = 0.0558333…°.
  it('formats 47.2095833°N 8.0558333°E as 47°12′34.5″N 8°03′21.0″E', () => {
    expect(formatDMS({ lat: 47 + 12 / 60 + 34.5 / 3600, lon: 8 + 3 / 60 + 21 / 3600 })).toBe(
      '47°12′34.5″N 8°03′21.0″E',
    );
  });

  it('formats southern and western values and carries rounded seconds into minutes', () => {
    expect(formatDMS({ lat: -33.9, lon: -151.2 })).toBe('33°54′00.0″S 151°12′00.0″W');
    expect(formatDMS({ lat: 10 + 59 / 60 + 59.97 / 3600, lon: 0 })).toBe(
      '11°00′00.0″N 0°00′00.0″E',
    );
    expect(formatDMS({ lat: 1.5, lon: 2.25 }, 0)).toBe('1°30′00″N 2°15′00″E');
  });

  it('formats decimal degrees as "lat, lon"', () => {
    expect(formatDecimal({ lat: 47.2, lon: 8.05 })).toBe('47.200000, 8.050000');
    expect(formatDecimal({ lat: -1.23456789, lon: 100 }, 3)).toBe('-1.235, 100.000');
  });
});

describe('parseCoordinate', () => {
  const cases: [string, number, number][] = [
    ['47.2, 8.05', 47.2, 8.05],
    ['47.2 8.05', 47.2, 8.05],
    ['-33.9; 151.2', -33.9, 151.2],
    ['47.2N 8.05E', 47.2, 8.05],
    ['N47.2 E8.05', 47.2, 8.05],
    ['8.05E 47.2N', 47.2, 8.05],
    ['47.2°N, 8.05°E', 47.2, 8.05],
    ['47°12′34.5″N 8°03′21.0″E', 47 + 12 / 60 + 34.5 / 3600, 8 + 3 / 60 + 21 / 3600],
    [`47°12'34.5"N 8°03'21.0"E`, 47 + 12 / 60 + 34.5 / 3600, 8 + 3 / 60 + 21 / 3600],
    ['47 12 34.5 8 3 21', 47 + 12 / 60 + 34.5 / 3600, 8 + 3 / 60 + 21 / 3600],
    ['33°54.0′S 151°12′W', -33.9, -151.2],
  ];
  it.each(cases)('reads %j', (text, lat, lon) => {
    const r = parseCoordinate(text);
    expect(r.ok).toBe(true);
    if (!r.ok) return;
    expect(Math.abs(r.lat - lat)).toBeLessThan(1e-12);
    expect(Math.abs(r.lon - lon)).toBeLessThan(1e-12);
  });

  it('reads UTM with a band letter and MGRS, spaced or not', () => {
    const p = { lat: 47.2, lon: 8.05 };
    for (const text of [
      formatUTM(p),
      toMGRS(p),
      toMGRS(p).replace(/^(\d+\w)(\w\w)(\d{5})(\d{5})$/, '$1 $2 $3 $4'),
    ]) {
      const r = parseCoordinate(text);
      expect(r.ok, text).toBe(true);
      if (r.ok) expect(gap(r, p), text).toBeLessThan(1.5);
    }
  });

  it.each([
    ['', /empty/],
    ['hello', /expected decimal degrees/],
    ['91, 0', /latitude 91/],
    ['0, 181', /longitude 181/],
    ['47.2N 8.05N', /same axis/],
    ['-47.2S, 8', /sign and a hemisphere/],
    ['47°75′N 8°E', /below 60/],
    ['32S 500000 1000000', /band S covers 32° to 40°/],
    ['32TMT123', /even number of digits/],
    ['61T 512345 5228765', /zone 61/],
  ])('rejects %j with a message', (text, message) => {
    const r = parseCoordinate(text);
    expect(r.ok).toBe(false);
    if (!r.ok) {
      expect(r.message).toMatch(message);
      expect(r.message).toMatch(/UTM .*MGRS/);
    }
  });

  it('never throws on arbitrary text (property)', () => {
    const pieces = fc.constantFrom(
      ' ',
      ',',
      '.',
      '-',
      '°',
      '′',
      '″',
      "'",
      '"',
      'N',
      'S',
      'E',
      'W',
      'T',
      'MT',
      '32',
      '47',
      '8.05',
      '123456',
    );
    fc.assert(
      fc.property(
        fc.oneof(
          fc.string({ unit: 'grapheme', maxLength: 40 }),
          fc.array(pieces, { maxLength: 12 }).map((a) => a.join('')),
        ),
        (text) => {
          const r = parseCoordinate(text);
          expect(typeof r.ok).toBe('boolean');
          if (r.ok) {
            expect(Math.abs(r.lat)).toBeLessThanOrEqual(90);
            expect(Math.abs(r.lon)).toBeLessThanOrEqual(180);
          }
        },
      ),
      { numRuns: 5000 },
    );
  });
});
