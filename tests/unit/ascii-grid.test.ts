/**
 * ESRI ASCII grids against GDAL's AAIGrid driver (Debian gdal-bin): the same .asc read by
 * Seedfall and by gdallocationinfo, corner- and centre-referenced, geographic and UTM.
 */
import { execFileSync } from 'node:child_process';
import { mkdtempSync, rmSync, writeFileSync } from 'node:fs';
import { tmpdir } from 'node:os';
import { join } from 'node:path';
import proj4 from 'proj4';
import { afterAll, beforeAll, describe, expect, it, vi } from 'vitest';
import {
  asciiCornerInMetres,
  DemError,
  type LatLonBox,
  readAsciiGrid,
  utmZoneEpsg,
} from '../../app/formats';
import { Rng } from '../../app/model';
import { expectClose } from './helpers';

vi.setConfig({ testTimeout: 60_000, hookTimeout: 60_000 });

let dir = '';
beforeAll(() => {
  dir = mkdtempSync(join(tmpdir(), 'seedfall-asc-'));
});
afterAll(() => {
  if (dir) rmSync(dir, { recursive: true, force: true });
});

const NODATA = -9999;
function gridText(
  ref: 'corner' | 'center',
  x: number,
  y: number,
  cell: number,
  cols = 30,
  rows = 20,
): string {
  const lines = [
    `ncols ${cols}`,
    `nrows ${rows}`,
    `xll${ref} ${x}`,
    `yll${ref} ${y}`,
    `cellsize ${cell}`,
    `NODATA_value ${NODATA}`,
  ];
  for (let r = 0; r < rows; r++) {
    const row: number[] = [];
    for (let c = 0; c < cols; c++) row.push(r === 4 && c === 6 ? NODATA : 1000 + r * 100 + c); // row, column readable in the value
    lines.push(row.join(' '));
  }
  return lines.join('\n') + '\n';
}

/** gdallocationinfo's cell values at WGS 84 points of a file (CRS assigned with -a_srs via a VRT). */
function gdalCells(path: string, srs: string, pts: { lat: number; lon: number }[]): number[] {
  const vrt = `${path}.vrt`;
  execFileSync('gdal_translate', ['-q', '-of', 'VRT', '-a_srs', srs, path, vrt]);
  return execFileSync('gdallocationinfo', ['-valonly', '-wgs84', vrt], {
    encoding: 'utf8',
    input: pts.map((p) => `${p.lon} ${p.lat}`).join('\n') + '\n',
  })
    .trim()
    .split('\n')
    .map(Number);
}

function randomPoints(box: LatLonBox, n: number, seed: number) {
  const rng = new Rng(seed);
  return Array.from({ length: n }, () => ({
    lat: box.south + (box.north - box.south) * rng.uniform(),
    lon: box.west + (box.east - box.west) * rng.uniform(),
  }));
}

describe('ESRI ASCII grid read like GDAL AAIGrid', () => {
  for (const ref of ['corner', 'center'] as const) {
    it(`xll${ref}/yll${ref} in WGS 84 degrees: every cell under a point equals gdallocationinfo`, () => {
      const text = gridText(ref, 21.2, 47.1, 0.002);
      const path = join(dir, `geo-${ref}.asc`);
      writeFileSync(path, text);
      // Inside the cell centres whichever reference (a centre reference moves the grid 0.001° south-west).
      const box = { south: 47.102, west: 21.202, north: 47.137, east: 21.257 };
      const { dem } = readAsciiGrid('geo.asc', text, { box });
      const pts = randomPoints(box, 300, ref.length);
      const gdal = gdalCells(path, 'EPSG:4326', pts);
      let nodata = 0;
      pts.forEach((p, i) => {
        if (gdal[i] === NODATA) {
          nodata++;
          expect(dem.cellAt(p)).toBeNull();
        } else expect(dem.cellAt(p)).toBe(gdal[i]); // GDAL AAIGrid driver, gdallocationinfo
      });
      expect(pts.length - nodata).toBeGreaterThan(290);
    });

    it(`xll${ref} in a stated UTM zone (EPSG:32633): cells equal gdallocationinfo`, () => {
      const text = gridText(ref, 400_000, 5_300_000, 50);
      const path = join(dir, `utm-${ref}.asc`);
      writeFileSync(path, text);
      const conv = proj4('WGS84', '+proj=utm +zone=33 +datum=WGS84 +units=m +no_defs');
      const ll = (x: number, y: number) => conv.inverse({ x, y });
      const sw = ll(400_100, 5_300_100);
      const ne = ll(401_400, 5_300_900);
      const box = { south: sw.y, west: sw.x, north: ne.y, east: ne.x };
      const { dem } = readAsciiGrid('utm.asc', text, { box, epsg: 32633 });
      const pts = randomPoints(box, 300, 5);
      const gdal = gdalCells(path, 'EPSG:32633', pts);
      pts.forEach((p, i) => {
        if (gdal[i] === NODATA) expect(dem.cellAt(p)).toBeNull();
        else expect(dem.cellAt(p)).toBe(gdal[i]); // GDAL AAIGrid driver, gdallocationinfo
      });
    });
  }

  it('a centre reference puts the south-west cell centre on the stated point', () => {
    // ESRI ASCII grid: xllcenter/yllcenter name the centre of the lower-left cell (common practice).
    const text = gridText('center', 21.2, 47.1, 0.002);
    const { dem } = readAsciiGrid('c.asc', text, {
      box: { south: 47.101, west: 21.201, north: 47.13, east: 21.25 },
    });
    // A corner reference of the same numbers puts that point on a cell corner instead: 4 cells' mean.
    const corner = readAsciiGrid('k.asc', gridText('corner', 21.2, 47.1, 0.002), {
      box: { south: 47.101, west: 21.201, north: 47.13, east: 21.25 },
    });
    expectClose(
      corner.dem.sample({ lat: 47.102, lon: 21.202 }) ?? NaN,
      (2800 + 2801 + 2900 + 2901) / 4,
      1e-4,
      'corner',
    );
    // 1e-9° inside the corner of the centres (the heights change 100 m per 0.002°: 5e-5 m).
    expectClose(
      dem.sample({ lat: 47.1 + 1e-9, lon: 21.2 + 1e-9 }) ?? NaN,
      1000 + 19 * 100,
      1e-4,
      'south-west centre',
    ); // row 19, col 0
  });

  it('keeps only the window under the box', () => {
    const text = gridText('corner', 21.2, 47.1, 0.002, 300, 200);
    const read = readAsciiGrid('w.asc', text, {
      box: { south: 47.2, west: 21.3, north: 47.21, east: 21.31 },
    });
    expect(read.fileCols).toBe(300);
    // 0.01° = 5 cells a side, plus the stencil's cell and 2 margin cells each way: at most 11 × 11.
    expect(read.cellsRead).toBeLessThanOrEqual(11 * 11);
    expect(read.cellsRead).toBe(read.window.cols * read.window.rows);
  });
});

describe('Hostile ASCII grids name the file and the line', () => {
  const box = { south: 47.101, west: 21.201, north: 47.13, east: 21.25 };
  const good = gridText('corner', 21.2, 47.1, 0.002);
  const fails = (text: string, re: RegExp, opts: { epsg?: number } = {}) => {
    let err: unknown = null;
    try {
      readAsciiGrid('bad.asc', text, { box, ...opts });
    } catch (e) {
      err = e;
    }
    expect(err).toBeInstanceOf(DemError);
    expect((err as Error).message).toMatch(/^bad\.asc: /);
    expect((err as Error).message).toMatch(re);
  };

  it('an unknown header key, with its line', () => {
    fails(good.replace('cellsize', 'cellsise'), /line 5: unknown header key 'cellsise'/);
  });
  it('a header value that is not a number, with its line', () => {
    fails(good.replace('nrows 20', 'nrows twenty'), /line 2: nrows 'twenty' is not a number/);
  });
  it('a missing cellsize', () => {
    fails(good.replace('cellsize 0.002\n', ''), /header has no cellsize/);
  });
  it('both xllcorner and xllcenter', () => {
    fails(
      good.replace('yllcorner', 'xllcenter 21.2\nyllcorner'),
      /line 4: xllcenter repeats an earlier header line/,
    );
  });
  it('a zero cell size, with the allowed range', () => {
    fails(good.replace('cellsize 0.002', 'cellsize 0'), /line 5: cellsize 0 must be > 0/);
  });
  it('a fractional ncols, with the allowed range', () => {
    fails(good.replace('ncols 30', 'ncols 30.5'), /line 1: ncols 30.5 must be a whole number ≥ 2/);
  });
  it('a row cut short: the data end early', () => {
    fails(
      good.trimEnd().split('\n').slice(0, -1).join('\n'),
      /line \d+: the data end after 570 values; ncols × nrows = 30 × 20 = 600/,
    );
  });
  it('a value that is not a number, with its line, row and column', () => {
    const lines = good.split('\n');
    lines[6 + 3] = lines[6 + 3].replace('1305', '13o5');
    fails(lines.join('\n'), /line 10: '13o5' is not a number \(row 4, column 6\)/);
  });
  it('too many values', () => {
    fails(good + '1 2 3\n', /line 27: more values than ncols × nrows/);
  });
  it('projected corners read as degrees: says to state the UTM zone', () => {
    fails(
      gridText('corner', 400_000, 5_300_000, 50),
      /not WGS 84 degrees.*needs its UTM zone stated/,
    );
  });
  it('an unknown EPSG code for the grid', () => {
    fails(good, /EPSG:2056 is not supported/, { epsg: 2056 });
  });
  it('a grid far from the plan says how far', () => {
    let msg = '';
    try {
      readAsciiGrid('bad.asc', good, {
        box: { south: 48.1, west: 21.21, north: 48.2, east: 21.22 },
      });
    } catch (e) {
      msg = (e as Error).message;
    }
    // Cell centres end at 47.139°; 48.1° is 0.961° of latitude further: about 107 km (1° ≈ 111.2 km, from memory).
    expect(msg).toMatch(
      /bad\.asc: the elevation model does not cover the plan area: it lies 10[67]\.\d km away/,
    );
  });
});

describe('the CRS a grid without one is read in', () => {
  it('takes a corner that cannot be degrees as metres', () => {
    expect(asciiCornerInMetres('ncols 2\nnrows 2\nxllcorner 7.1\nyllcorner 46.2\n')).toBe(false);
    expect(asciiCornerInMetres('ncols 2\nnrows 2\nxllcorner -179.5\nyllcenter -89\n')).toBe(false);
    expect(asciiCornerInMetres('ncols 2\nnrows 2\nxllcorner 512000\nyllcorner 5100000\n')).toBe(
      true,
    );
    expect(asciiCornerInMetres('NCOLS 2\nXLLCENTER 300000.5\nYLLCENTER 12.5\n')).toBe(true);
    // No corner at all: not metres (the reader then reports the header).
    expect(asciiCornerInMetres('ncols 2\nnrows 2\n')).toBe(false);
  });

  it('names the WGS 84 / UTM zone of a point', () => {
    // Zone = floor((lon + 180) / 6) + 1; EPSG 326zz north, 327zz south; zone 32 is widened over
    // south-west Norway (56–64° N, 3–12° E). // common practice
    expect(utmZoneEpsg({ lat: 46.2, lon: 7.1 })).toBe(32632);
    expect(utmZoneEpsg({ lat: -33.9, lon: 18.4 })).toBe(32734);
    expect(utmZoneEpsg({ lat: 60.4, lon: 5.3 })).toBe(32632);
    expect(utmZoneEpsg({ lat: 0.5, lon: -179.9 })).toBe(32601);
  });
});
