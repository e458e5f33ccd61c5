import { describe, expect, it } from 'vitest';
import { decodeMvt } from '../../app/map/mvt';
import { command, mvtTile, zz } from '../e2e/basemap-files';

describe('the vector tile reader', () => {
  // MVT specification 2.1, §4.3.5 "Example Geometry Encodings" (the encoded arrays and their
  // points as the specification gives them). // from memory
  it('reads the specification’s point, line and polygon examples', () => {
    const tile = mvtTile([
      {
        name: 'examples',
        features: [
          { type: 1, geometry: [9, 50, 34] },
          { type: 2, geometry: [9, 4, 4, 18, 0, 16, 16, 0] },
          { type: 3, geometry: [9, 6, 12, 18, 10, 12, 24, 44, 15] },
        ],
      },
    ]);
    const [layer] = decodeMvt(tile);
    expect(layer.name).toBe('examples');
    expect(layer.extent).toBe(4096);
    expect(layer.features.map((f) => f.type)).toEqual([1, 2, 3]);
    expect(layer.features[0].parts).toEqual([[25, 17]]);
    expect(layer.features[1].parts).toEqual([[2, 2, 2, 10, 10, 10]]);
    // ClosePath returns to the ring's first point.
    expect(layer.features[2].parts).toEqual([[3, 6, 8, 12, 20, 34, 3, 6]]);
  });

  it('reads several layers and a polygon with a hole as two rings', () => {
    const ring = (x0: number, y0: number, s: number): number[] => [
      command(1, 1),
      zz(x0),
      zz(y0),
      command(2, 3),
      zz(s),
      zz(0),
      zz(0),
      zz(s),
      zz(-s),
      zz(0),
      command(7, 1),
    ];
    // The second ring's start is relative to the first ring's last point (x0, y0 + s).
    const outer = ring(0, 0, 100);
    const hole = [command(1, 1), zz(25), zz(-75), ...ring(0, 0, 50).slice(3)];
    const tile = mvtTile([
      { name: 'water', extent: 512, features: [{ type: 3, geometry: [...outer, ...hole] }] },
      { name: 'roads', features: [] },
    ]);
    const layers = decodeMvt(tile);
    expect(layers.map((l) => [l.name, l.extent])).toEqual([
      ['water', 512],
      ['roads', 4096],
    ]);
    expect(layers[0].features[0].parts).toEqual([
      [0, 0, 100, 0, 100, 100, 0, 100, 0, 0],
      [25, 25, 75, 25, 75, 75, 25, 75, 25, 25],
    ]);
  });

  it('refuses a truncated tile and an unknown command with a message', () => {
    const tile = mvtTile([{ name: 'water', features: [{ type: 3, geometry: [9, 6, 12] }] }]);
    expect(() => decodeMvt(tile.subarray(0, tile.length - 3))).toThrow(/vector tile/);
    const bad = mvtTile([
      { name: 'water', features: [{ type: 2, geometry: [command(4, 1), 2, 2] }] },
    ]);
    expect(() => decodeMvt(bad)).toThrow(/unknown geometry command 4/);
  });
});
