/**
 * GeoTIFF elevation models against GDAL (Debian gdal-bin): files made here with gdal_translate
 * and gdal_create, sampled by Seedfall and by gdallocationinfo / gdalwarp.
 *
 * GDAL 3.6's gdallocationinfo has no -r bilinear (it reads the cell under the point), so the
 * bilinear sampler is checked against gdalwarp -r bilinear -et 0: each target pixel of a warp
 * onto a finer grid is GDAL's bilinear value at that pixel's centre, transformed exactly.
 */
import { execFileSync } from 'node:child_process';
import {
  mkdtempSync,
  openSync,
  readFileSync,
  readSync,
  rmSync,
  statSync,
  writeFileSync,
} from 'node:fs';
import { tmpdir } from 'node:os';
import { join } from 'node:path';
import proj4 from 'proj4';
import { afterAll, beforeAll, describe, expect, it, vi } from 'vitest';

// GDAL runs as child processes; on two loaded cores they may take a while (no timing is asserted).
vi.setConfig({ testTimeout: 60_000, hookTimeout: 60_000 });
import {
  type ByteSource,
  Dem,
  DemAreaError,
  DemError,
  type LatLonBox,
  readGeoTiffDem,
} from '../../app/formats';
import { LocalFrame, Rng } from '../../app/model';
import { expectClose, geodesicDistance_m } from './helpers';

let dir = '';
const gdal = (cmd: string, args: string[], input?: string) =>
  execFileSync(cmd, args, { encoding: 'utf8', input, maxBuffer: 64 << 20 });

/** A ByteSource over a file on disk (what the CLI will pass). */
function fileSource(path: string): ByteSource {
  const fd = openSync(path, 'r');
  return {
    size: statSync(path).size,
    read: async (offset, length) => {
      const b = Buffer.alloc(length);
      readSync(fd, b, 0, length, offset);
      return b.buffer.slice(b.byteOffset, b.byteOffset + length);
    },
  };
}

const NODATA = -9999;
/** Invented rough terrain, Float32-exact to 1/64 m; a nodata block in rows 10–13, cols 20–24. */
function heights(cols: number, rows: number, seed: number): number[] {
  const rng = new Rng(seed);
  const v: number[] = [];
  for (let r = 0; r < rows; r++) {
    for (let c = 0; c < cols; c++) {
      const smooth = 800 + 40 * Math.sin(c / 7) + 30 * Math.cos(r / 5) + 0.8 * c * r;
      v.push(
        r >= 10 && r < 14 && c >= 20 && c < 25
          ? NODATA
          : Math.round((smooth + 20 * rng.uniform()) * 64) / 64,
      );
    }
  }
  return v;
}

function writeAsc(
  path: string,
  cols: number,
  rows: number,
  x: number,
  y: number,
  cell: number,
  v: number[],
) {
  const lines = [
    `ncols ${cols}`,
    `nrows ${rows}`,
    `xllcorner ${x}`,
    `yllcorner ${y}`,
    `cellsize ${cell}`,
    `NODATA_value ${NODATA}`,
  ];
  for (let r = 0; r < rows; r++) lines.push(v.slice(r * cols, (r + 1) * cols).join(' '));
  writeFileSync(path, lines.join('\n') + '\n');
}

// Geographic: 60 × 50 cells of 0.001° from (21.0 E, 47.0 N). UTM 34N: 60 × 50 cells of 30 m.
const GEO = { cols: 60, rows: 50, x: 21.0, y: 47.0, cell: 0.001 };
const UTM = { cols: 60, rows: 50, x: 500_000, y: 5_200_000, cell: 30 };
const toUtm = proj4('WGS84', '+proj=utm +zone=34 +datum=WGS84 +units=m +no_defs');
const utmLL = (x: number, y: number) => {
  const p = toUtm.inverse({ x, y });
  return { lat: p.y, lon: p.x };
};
const GEO_BOX: LatLonBox = { south: 47.003, west: 21.003, north: 47.047, east: 21.057 };
const UTM_BOX: LatLonBox = (() => {
  const sw = utmLL(UTM.x + 100, UTM.y + 100);
  const ne = utmLL(UTM.x + 1700, UTM.y + 1400);
  return { south: sw.lat, west: sw.lon, north: ne.lat, east: ne.lon };
})();
let geoTif = '';
let utmTif = '';

beforeAll(() => {
  dir = mkdtempSync(join(tmpdir(), 'seedfall-dem-'));
  writeAsc(
    join(dir, 'geo.asc'),
    GEO.cols,
    GEO.rows,
    GEO.x,
    GEO.y,
    GEO.cell,
    heights(GEO.cols, GEO.rows, 1),
  );
  writeAsc(
    join(dir, 'utm.asc'),
    UTM.cols,
    UTM.rows,
    UTM.x,
    UTM.y,
    UTM.cell,
    heights(UTM.cols, UTM.rows, 2),
  );
  geoTif = join(dir, 'geo.tif');
  utmTif = join(dir, 'utm.tif');
  gdal('gdal_translate', [
    '-q',
    '-ot',
    'Float32',
    '-a_srs',
    'EPSG:4326',
    join(dir, 'geo.asc'),
    geoTif,
  ]);
  gdal('gdal_translate', [
    '-q',
    '-ot',
    'Float32',
    '-a_srs',
    'EPSG:32634',
    join(dir, 'utm.asc'),
    utmTif,
  ]);
});
afterAll(() => {
  if (dir) rmSync(dir, { recursive: true, force: true });
});

/** GDAL's bilinear values at the centres of a target grid in EPSG:4326 (gdalwarp, exact transform). */
function gdalBilinear(src: string, box: LatLonBox, nx: number, ny: number) {
  const out = join(dir, `warp-${Math.random().toString(36).slice(2)}.asc`);
  gdal('gdalwarp', [
    '-q',
    '-overwrite',
    '-r',
    'bilinear',
    '-et',
    '0',
    '-ot',
    'Float64',
    '-t_srs',
    'EPSG:4326',
    '-dstnodata',
    '-32768',
    '-te',
    `${box.west}`,
    `${box.south}`,
    `${box.east}`,
    `${box.north}`,
    '-ts',
    `${nx}`,
    `${ny}`,
    '-of',
    'AAIGrid',
    src,
    out,
  ]);
  // Header lines start with a letter (ncols … NODATA_value, dx/dy when the cells are not square).
  const rows = readFileSync(out, 'utf8')
    .trim()
    .split('\n')
    .filter((l) => !/^[A-Za-z]/.test(l));
  const dLon = (box.east - box.west) / nx;
  const dLat = (box.north - box.south) / ny;
  const pts: { lat: number; lon: number; z: number }[] = [];
  rows.forEach((line, r) =>
    line
      .trim()
      .split(/\s+/)
      .forEach((s, c) => {
        const z = Number(s);
        if (z !== -32768)
          pts.push({ lat: box.north - (r + 0.5) * dLat, lon: box.west + (c + 0.5) * dLon, z });
      }),
  );
  return pts;
}

describe('GeoTIFF DEM sampled against GDAL', () => {
  for (const [name, tif, box] of [
    ['geographic EPSG:4326', () => geoTif, GEO_BOX],
    ['UTM EPSG:32634', () => utmTif, UTM_BOX],
  ] as const) {
    it(`bilinear heights equal gdalwarp -r bilinear at ${name} (to 1 mm)`, async () => {
      const { dem } = await readGeoTiffDem(tif(), fileSource(tif()), { box });
      // A target grid finer than the cells, offset at random so its centres fall anywhere in them.
      const rng = new Rng(name.length);
      const inner: LatLonBox = {
        south: box.south + 0.0005 + 0.001 * rng.uniform(),
        west: box.west + 0.0005 + 0.001 * rng.uniform(),
        north: box.north - 0.0005,
        east: box.east - 0.0005,
      };
      const pts = gdalBilinear(tif(), inner, 73, 61);
      let compared = 0;
      for (const p of pts) {
        const z = dem.sample(p);
        if (z === null) continue; // beside nodata (GDAL reweights the valid cells; Seedfall refuses)
        expectClose(z, p.z, 1e-3, `(${p.lat}, ${p.lon})`); // GDAL gdalwarp bilinear
        compared++;
      }
      expect(compared).toBeGreaterThan(0.9 * 73 * 61);
    });

    it(`the cell under a point equals gdallocationinfo -wgs84 at ${name}, nodata as null`, async () => {
      const { dem } = await readGeoTiffDem(tif(), fileSource(tif()), { box });
      const rng = new Rng(7);
      const pts = Array.from({ length: 400 }, () => ({
        lat: box.south + (box.north - box.south) * rng.uniform(),
        lon: box.west + (box.east - box.west) * rng.uniform(),
      }));
      const out = gdal(
        'gdallocationinfo',
        ['-valonly', '-wgs84', tif()],
        pts.map((p) => `${p.lon} ${p.lat}`).join('\n') + '\n',
      )
        .trim()
        .split('\n')
        .map(Number);
      expect(out).toHaveLength(pts.length);
      let nodata = 0;
      pts.forEach((p, i) => {
        const mine = dem.cellAt(p);
        if (out[i] === NODATA) {
          expect(mine).toBeNull(); // gdallocationinfo prints the nodata value there
          nodata++;
        } else {
          expectClose(mine ?? NaN, out[i], 1e-6, `cell at (${p.lat}, ${p.lon})`); // GDAL gdallocationinfo
        }
      });
      expect(out.length - nodata).toBeGreaterThan(350);
    });
  }

  it('a point-registered GeoTIFF (AREA_OR_POINT=Point) reads its cells where GDAL does', async () => {
    // GDAL writes the tie point at the first cell's centre and reads it back half a cell out.
    const point = join(dir, 'point.tif');
    gdal('gdal_translate', ['-q', '-mo', 'AREA_OR_POINT=Point', geoTif, point]);
    expect(gdal('gdalinfo', [point])).toMatch(/AREA_OR_POINT=Point/);
    const { dem } = await readGeoTiffDem(point, fileSource(point), { box: GEO_BOX });
    const rng = new Rng(21);
    const pts = Array.from({ length: 200 }, () => ({
      lat: GEO_BOX.south + (GEO_BOX.north - GEO_BOX.south) * rng.uniform(),
      lon: GEO_BOX.west + (GEO_BOX.east - GEO_BOX.west) * rng.uniform(),
    }));
    const out = gdal(
      'gdallocationinfo',
      ['-valonly', '-wgs84', point],
      pts.map((p) => `${p.lon} ${p.lat}`).join('\n') + '\n',
    )
      .trim()
      .split('\n')
      .map(Number);
    pts.forEach((p, i) => expect(dem.cellAt(p)).toBe(out[i] === NODATA ? null : out[i])); // GDAL gdallocationinfo
  });

  it('a point over nodata samples null, never 0, and gdallocationinfo reads nodata there', async () => {
    const { dem } = await readGeoTiffDem(geoTif, fileSource(geoTif), { box: GEO_BOX });
    // Centre of cell (row 11, col 22) of the nodata block.
    const p = { lat: GEO.y + (GEO.rows - 11.5) * GEO.cell, lon: GEO.x + 22.5 * GEO.cell };
    expect(
      gdal('gdallocationinfo', ['-valonly', '-wgs84', geoTif, `${p.lon}`, `${p.lat}`]).trim(),
    ).toBe(`${NODATA}`);
    expect(dem.sample(p)).toBeNull();
    expect(dem.cellAt(p)).toBeNull();
    // Half a cell outside the block the bilinear stencil still touches it: null too.
    expect(dem.sample({ lat: p.lat, lon: p.lon + 2.9 * GEO.cell })).toBeNull();
    expect(dem.sample({ lat: p.lat, lon: p.lon + 3.6 * GEO.cell })).not.toBeNull();
  });

  it('the local-frame ground returns the same heights as the WGS 84 sampler', async () => {
    const { dem } = await readGeoTiffDem(utmTif, fileSource(utmTif), { box: UTM_BOX });
    const c = utmLL(UTM.x + 900, UTM.y + 700);
    const frame = new LocalFrame(c);
    const ground = dem.ground(frame);
    for (const [x, y] of [
      [0, 0],
      [120, -80],
      [-300, 210],
    ]) {
      expect(ground.height(x, y)).toBe(dem.sample(frame.toLatLon(x, y))); // common practice
    }
    expect(ground.maxHeight_m).toBeGreaterThanOrEqual(ground.height(0, 0) ?? Infinity);
  });
});

describe('A plane DEM', () => {
  it('bilinear sampling reproduces z = a·x + b·y + c exactly', () => {
    // Bilinear interpolation is exact for any function linear in x and y (common practice).
    const cols = 40;
    const rows = 30;
    const values = new Float32Array(cols * rows);
    for (let r = 0; r < rows; r++)
      for (let c = 0; c < cols; c++) values[r * cols + c] = 600 + 3 * c - 2 * r;
    const x0 = 510_000;
    const y0 = 5_201_000;
    const dem = new Dem({
      file: 'plane',
      epsg: 32634,
      cols,
      rows,
      x0,
      y0,
      dx: 25,
      dy: 25,
      values,
      nodata: null,
    });
    const rng = new Rng(3);
    for (let k = 0; k < 500; k++) {
      const x = x0 + 12.5 + (cols - 1) * 25 * rng.uniform();
      const y = y0 - 12.5 - (rows - 1) * 25 * rng.uniform();
      const c = (x - x0) / 25 - 0.5;
      const r = (y0 - y) / 25 - 0.5;
      expectClose(dem.sampleCrs(x, y) ?? NaN, 600 + 3 * c - 2 * r, 1e-9, `(${x}, ${y})`);
      // Through WGS 84 and back with proj4: the same plane within 1e-6 m.
      expectClose(dem.sample(utmLL(x, y)) ?? NaN, 600 + 3 * c - 2 * r, 1e-6);
    }
  });
});

describe('Hostile GeoTIFFs', () => {
  const fails = async (path: string, box: LatLonBox, ...parts: RegExp[]) => {
    const err = await readGeoTiffDem('hostile.tif', fileSource(path), { box }).then(
      () => null,
      (e: unknown) => e,
    );
    expect(err).toBeInstanceOf(DemError);
    // Only an area the file does not hold is an area error (a smaller area may still be read).
    const areaFault = parts.some((p) =>
      /does not cover|covers only part|cells, more than/.test(p.source),
    );
    expect(err instanceof DemAreaError).toBe(areaFault);
    const msg = (err as Error).message;
    expect(msg.startsWith('hostile.tif: ')).toBe(true);
    for (const p of parts) expect(msg).toMatch(p);
    return msg;
  };

  it('a truncated TIFF is named as truncated, at every cut', async () => {
    const bytes = readFileSync(geoTif);
    for (const keep of [6, 100, 400, Math.floor(bytes.length / 2), bytes.length - 10]) {
      const cut = join(dir, `cut-${keep}.tif`);
      writeFileSync(cut, bytes.subarray(0, keep));
      await fails(cut, GEO_BOX, /truncated or corrupt/);
    }
  });

  it('a 3-band TIFF is refused with its band count', async () => {
    const three = join(dir, 'three.tif');
    gdal('gdal_translate', ['-q', '-b', '1', '-b', '1', '-b', '1', geoTif, three]);
    await fails(three, GEO_BOX, /it has 3 bands; an elevation model has exactly 1/);
  });

  it('a CRS proj4 is not given (EPSG:3035) is named, with the supported list', async () => {
    const laea = join(dir, 'laea.tif');
    gdal('gdal_translate', [
      '-q',
      '-a_srs',
      'EPSG:3035',
      '-a_ullr',
      '5000000',
      '2800000',
      '5060000',
      '2750000',
      geoTif,
      laea,
    ]);
    await fails(laea, GEO_BOX, /EPSG:3035 is not supported/, /EPSG:32601–32660/);
  });

  it('a DEM far from the plan says how far, against GeographicLib', async () => {
    // The plan area 0.5° east of the model (its east edge of cell centres at 21.0595°).
    const box = { south: 47.01, west: 21.5595, north: 47.02, east: 21.6 };
    const msg = await fails(geoTif, box, /does not cover the plan area: it lies [\d.]+ km away/);
    const km = Number(/lies ([\d.]+) km/.exec(msg)?.[1]);
    // Nearest points: same latitude within the overlap band, 0.5° of longitude apart (Karney 2013).
    const ref =
      geodesicDistance_m({ lat: 47.015, lon: 21.0595 }, { lat: 47.015, lon: 21.5595 }) / 1000;
    expectClose(km, ref, 0.1, 'gap km');
  });

  it('a DEM covering part of the plan says on which side and by how much', async () => {
    const box = { ...GEO_BOX, north: 47.06 }; // centres end at 47.0495: 0.0105° ≈ 1168 m short
    const msg = await fails(
      geoTif,
      box,
      /covers only part of the plan area: it falls short by \d+ m to the north/,
    );
    const m = Number(/by (\d+) m/.exec(msg)?.[1]);
    expectClose(
      m,
      geodesicDistance_m({ lat: 47.0495, lon: 21.03 }, { lat: 47.06, lon: 21.03 }),
      2,
      'shortfall',
    ); // Karney 2013
  });

  it('a window past the cell limit is refused with the limit', async () => {
    await expect(
      readGeoTiffDem('big.tif', fileSource(geoTif), { box: GEO_BOX, maxCells: 100 }),
    ).rejects.toThrow(
      /big\.tif: the plan area needs \d+ × \d+ = \d+ cells, more than the limit of 100/,
    );
  });
});

describe('A 4000 × 4000 DEM', () => {
  it('reads only the window under the plan area, strips or tiles', async () => {
    // Int16 heights (row·7 + col·3) mod 3000 in UTM 34N, 10 m cells, written raw (EHdr) and
    // converted by gdal_translate; 32 MB of cells.
    const n = 4000;
    const raw = new Int16Array(n * n);
    for (let r = 0; r < n; r++) for (let c = 0; c < n; c++) raw[r * n + c] = (r * 7 + c * 3) % 3000;
    const bil = join(dir, 'big.bil');
    writeFileSync(bil, Buffer.from(raw.buffer));
    writeFileSync(
      join(dir, 'big.hdr'),
      `BYTEORDER I\nLAYOUT BIL\nNROWS ${n}\nNCOLS ${n}\nNBANDS 1\nNBITS 16\nPIXELTYPE SIGNEDINT\nULXMAP 480005\nULYMAP 5239995\nXDIM 10\nYDIM 10\n`,
    );
    const origin = { x: 480_000, y: 5_240_000 };
    // Plan area: 600 m × 400 m around cell (row 2000, col 1500).
    const sw = utmLL(origin.x + 15_000 - 300, origin.y - 20_000 - 200);
    const ne = utmLL(origin.x + 15_000 + 300, origin.y - 20_000 + 200);
    const box = { south: sw.lat, west: sw.lon, north: ne.lat, east: ne.lon };
    for (const co of [[], ['-co', 'TILED=YES', '-co', 'COMPRESS=DEFLATE']]) {
      const tif = join(dir, `big-${co.length}.tif`);
      gdal('gdal_translate', ['-q', '-a_srs', 'EPSG:32634', ...co, bil, tif]);
      const read = await readGeoTiffDem(tif, fileSource(tif), { box });
      expect(read.fileCols).toBe(n);
      expect(read.fileRows).toBe(n);
      // The box spans about 60 × 40 cells; the window adds the edges' curvature and 2 + 1 cells a side.
      expect(read.window.cols).toBeLessThanOrEqual(70);
      expect(read.window.rows).toBeLessThanOrEqual(50);
      expect(read.cellsRead).toBe(read.window.cols * read.window.rows);
      expect(read.cellsRead).toBeLessThan((n * n) / 4000);
      // Bytes fetched: the strips or tiles under the window, a small share of the file.
      expect(read.bytesRead).toBeLessThan(statSync(tif).size / 20);
      const rng = new Rng(co.length + 11);
      const pts = Array.from({ length: 50 }, () => ({
        lat: box.south + (box.north - box.south) * rng.uniform(),
        lon: box.west + (box.east - box.west) * rng.uniform(),
      }));
      const gdalCells = gdal(
        'gdallocationinfo',
        ['-valonly', '-wgs84', tif],
        pts.map((p) => `${p.lon} ${p.lat}`).join('\n') + '\n',
      )
        .trim()
        .split('\n')
        .map(Number);
      pts.forEach((p, i) => expect(read.dem.cellAt(p)).toBe(gdalCells[i])); // GDAL gdallocationinfo
    }
  }, 180_000);
});
