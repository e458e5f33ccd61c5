import { describe, expect, it } from 'vitest';
import {
  MAX_MERCATOR_LAT,
  tileCount,
  tileRange,
  tilesOf,
  tileUrlOf,
  tileX,
  tileY,
} from '../../app/map/basemap-tiles';

describe('Web Mercator tile numbering', () => {
  it('puts the whole world in tile 0/0/0 and splits it in four at zoom 1', () => {
    // Slippy map tilenames (OpenStreetMap wiki): zoom z has 2^z × 2^z tiles, x from 180° W,
    // y from the north edge at 85.0511° N. // from memory
    expect([tileX(-179.9, 0), tileY(80, 0)]).toEqual([0, 0]);
    expect([tileX(-1, 1), tileY(1, 1)]).toEqual([0, 0]);
    expect([tileX(1, 1), tileY(-1, 1)]).toEqual([1, 1]);
    expect(tileY(MAX_MERCATOR_LAT, 5)).toBe(0);
    expect(tileY(-MAX_MERCATOR_LAT, 5)).toBe(31);
    expect(tileX(180, 5)).toBe(31); // the antimeridian belongs to the last column
  });

  it('numbers a point by the closed form y = (1 − ln(tan φ + sec φ)/π)/2 · 2^z', () => {
    // Worked by hand: at 45° N, ln(tan 45° + sec 45°) = ln(1 + √2) = 0.881374; (1 − 0.280549)/2
    // = 0.359725; × 2^10 = 368.36 → row 368. 10° E: (190/360) × 1024 = 540.44 → column 540.
    expect(tileY(45, 10)).toBe(368);
    expect(tileX(10, 10)).toBe(540);
  });

  it('counts the tiles of an area as the product of its column and row ranges per zoom', () => {
    const area = { south: 47.46, west: 21.03, north: 47.52, east: 21.13 };
    let n = 0;
    for (let z = 8; z <= 15; z++) {
      const r = tileRange(area, z);
      n += (r.x1 - r.x0 + 1) * (r.y1 - r.y0 + 1);
    }
    expect(tileCount(area, 8, 15)).toBe(n);
    expect([...tilesOf(area, 8, 15)].length).toBe(n);
    // Each zoom step doubles the columns and rows: about four times the tiles. // common practice
    expect(tileCount(area, 18, 18) / tileCount(area, 17, 17)).toBeGreaterThan(3);
  });

  it('fills a URL template', () => {
    expect(tileUrlOf('https://{s}.example.test/{z}/{x}/{y}{r}.png', 3, 4, 5)).toBe(
      'https://a.example.test/3/4/5.png',
    );
  });
});
