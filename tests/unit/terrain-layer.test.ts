/**
 * The terrain layer's computations: hillshade and block-mean downsampling against GDAL (Debian
 * gdal-bin: `gdaldem hillshade`, `gdal_translate -r average`) on grids made here, and contour
 * lines of a plane and a cone against their closed forms.
 */
import { execFileSync } from 'node:child_process';
import { mkdtempSync, readFileSync, rmSync, writeFileSync } from 'node:fs';
import { tmpdir } from 'node:os';
import { join } from 'node:path';
import { afterAll, beforeAll, describe, expect, it, vi } from 'vitest';
import type { DemGrid } from '../../app/formats';
import {
  contourInterval,
  contourLevels,
  contours,
  downsampleSteps,
  flatShade,
  hillshade,
  run,
  type ShadeGrid,
} from '../../app/map/terrain-shade';
import { Rng } from '../../app/model';

// GDAL runs as child processes; on two loaded cores they may take a while (no timing is asserted).
vi.setConfig({ testTimeout: 60_000, hookTimeout: 60_000 });

let dir = '';
const gdal = (cmd: string, args: string[]) =>
  execFileSync(cmd, args, { encoding: 'utf8', maxBuffer: 64 << 20 });
beforeAll(() => {
  dir = mkdtempSync(join(tmpdir(), 'seedfall-shade-'));
});
afterAll(() => {
  if (dir) rmSync(dir, { recursive: true, force: true });
});

const NODATA = -9999;
/** Invented hills, Float32-exact to 1/64 m; a nodata block in rows 20–23, cols 30–35. */
function hills(cols: number, rows: number, seed: number, relief: number): number[] {
  const rng = new Rng(seed);
  const v: number[] = [];
  for (let r = 0; r < rows; r++) {
    for (let c = 0; c < cols; c++) {
      const z =
        900 +
        relief * (Math.sin(c / 6) * Math.cos(r / 9) + 0.5 * Math.sin((c + r) / 4)) +
        0.05 * relief * rng.uniform();
      v.push(r >= 20 && r < 24 && c >= 30 && c < 36 ? NODATA : Math.round(z * 64) / 64);
    }
  }
  return v;
}

function writeAsc(path: string, g: Omit<DemGrid, 'values' | 'file' | 'epsg'>, v: number[]) {
  const lines = [
    `ncols ${g.cols}`,
    `nrows ${g.rows}`,
    `xllcorner ${g.x0}`,
    `yllcorner ${g.y0 - g.rows * g.dy}`,
    `cellsize ${g.dx}`,
    `NODATA_value ${NODATA}`,
  ];
  for (let r = 0; r < g.rows; r++) lines.push(v.slice(r * g.cols, (r + 1) * g.cols).join(' '));
  writeFileSync(path, lines.join('\n') + '\n');
}

/** The cells of a one-band raster as GDAL writes them to an ASCII grid (row-major from the north). */
function readRaster(path: string): { values: number[]; nodata: number | null } {
  const asc = join(dir, `read-${Math.random().toString(36).slice(2)}.asc`);
  gdal('gdal_translate', ['-q', '-of', 'AAIGrid', path, asc]);
  const text = readFileSync(asc, 'utf8').trim().split('\n');
  const nd = text.find((l) => /^NODATA_value/i.test(l));
  const rows = text.filter((l) => !/^[A-Za-z]/.test(l));
  return {
    values: rows.flatMap((l) => l.trim().split(/\s+/).map(Number)),
    nodata: nd ? Number(nd.split(/\s+/)[1]) : null,
  };
}

function grid(
  epsg: number,
  geo: { cols: number; rows: number; x0: number; y0: number; cell: number },
  v: number[],
): DemGrid {
  return {
    file: 'test',
    epsg,
    cols: geo.cols,
    rows: geo.rows,
    x0: geo.x0,
    y0: geo.y0,
    dx: geo.cell,
    dy: geo.cell,
    values: Float32Array.from(v),
    nodata: NODATA,
  };
}

/** Writes a grid as a Float32 GeoTIFF in its CRS (through an ASCII grid and gdal_translate). */
function writeTif(name: string, g: DemGrid): string {
  const asc = join(dir, `${name}.asc`);
  writeAsc(asc, g, [...g.values]);
  const tif = join(dir, `${name}.tif`);
  gdal('gdal_translate', ['-q', '-ot', 'Float32', '-a_srs', `EPSG:${g.epsg}`, asc, tif]);
  return tif;
}

describe('hillshade against gdaldem hillshade (GDAL 3.6, -az 315 -alt 45)', () => {
  const cases = [
    {
      name: 'UTM 34N, 25 m cells, steep relief',
      epsg: 32634,
      geo: { cols: 70, rows: 50, x0: 500_000, y0: 5_201_250, cell: 25 },
      relief: 120,
      scale: 1,
      gdalArgs: [] as string[],
    },
    {
      name: 'UTM 34N, 10 m cells, gentle relief, light from 200° at 30°',
      epsg: 32634,
      geo: { cols: 60, rows: 45, x0: 500_000, y0: 5_200_450, cell: 10 },
      relief: 6,
      scale: 1,
      gdalArgs: ['-az', '200', '-alt', '30'],
      opts: { azimuth_deg: 200, altitude_deg: 30 },
    },
    {
      // GDAL's documented way for degrees: one scale for both axes (-s 111120).
      name: 'geographic, 0.0003° cells, scale 111120 m per degree',
      epsg: 4326,
      geo: { cols: 60, rows: 40, x0: 21.0, y0: 47.012, cell: 0.0003 },
      relief: 40,
      scale: 111120,
      gdalArgs: ['-s', '111120'],
    },
  ];
  for (const k of cases) {
    it(`matches GDAL to one grey level in every cell inside the edge (${k.name})`, () => {
      const g = grid(k.epsg, k.geo, hills(k.geo.cols, k.geo.rows, 3, k.relief));
      const tif = writeTif(`hs-${k.epsg}-${k.geo.cell}`, g);
      const out = join(dir, `hs-out-${k.epsg}-${k.geo.cell}.tif`);
      gdal('gdaldem', ['hillshade', '-q', '-compute_edges', ...k.gdalArgs, tif, out]);
      const ref = readRaster(out);
      const shade = hillshade(run(downsampleSteps(g)), {
        ...(k.opts ?? {}),
        scale: { x: k.scale, y: k.scale },
      });
      let compared = 0;
      let maxDiff = 0;
      for (let r = 1; r < g.rows - 1; r++) {
        for (let c = 1; c < g.cols - 1; c++) {
          const i = r * g.cols + c;
          const want = ref.values[i];
          if (want === ref.nodata) {
            // GDAL writes its nodata (0) exactly where the height is unknown.
            expect(shade[i], `cell ${c},${r}`).toBe(0);
            continue;
          }
          maxDiff = Math.max(maxDiff, Math.abs(shade[i] - want));
          compared++;
        }
      }
      // GDAL rounds to a byte; one level of rounding difference is allowed.
      expect(maxDiff).toBeLessThanOrEqual(1);
      expect(compared).toBeGreaterThan(0.9 * (g.cols - 2) * (g.rows - 2));
      // The relief is strong enough that the shades span a real range (not all flat).
      const known = [...shade].filter((s) => s > 0);
      expect(Math.max(...known) - Math.min(...known)).toBeGreaterThan(k.relief > 10 ? 100 : 10);
    });
  }

  it('gives flat ground 1 + 254·sin(altitude) and unknown cells 0', () => {
    // Closed form: on flat ground the slope is 0, so the value is cos(zenith) = sin(altitude).
    const g: ShadeGrid = {
      file: 'flat',
      epsg: 32634,
      cols: 5,
      rows: 4,
      x0: 0,
      y0: 0,
      dx: 30,
      dy: 30,
      values: Float32Array.from({ length: 20 }, (_, i) => (i === 7 ? NaN : 412)),
      nodata: null,
    };
    const s = hillshade(g);
    expect(s[7]).toBe(0);
    for (const [i, x] of s.entries()) if (i !== 7) expect(x).toBe(Math.round(flatShade(45)));
    expect(Math.round(flatShade(45))).toBe(181);
  });
});

describe('downsampling against gdal_translate -r average', () => {
  it('averages whole 3 × 3 blocks as GDAL does, leaving nodata out of each mean', () => {
    const geo = { cols: 90, rows: 60, x0: 500_000, y0: 5_201_800, cell: 30 };
    const g = grid(32634, geo, hills(geo.cols, geo.rows, 5, 80));
    const tif = writeTif('ds', g);
    const out = join(dir, 'ds-out.tif');
    gdal('gdal_translate', ['-q', '-r', 'average', '-outsize', '30', '20', tif, out]);
    const ref = readRaster(out);
    const d = run(downsampleSteps(g, 30));
    expect([d.cols, d.rows, d.dx, d.dy]).toEqual([30, 20, 90, 90]);
    expect([d.x0, d.y0]).toEqual([g.x0, g.y0]);
    for (let i = 0; i < d.values.length; i++) {
      if (ref.values[i] === ref.nodata) expect(d.values[i]).toBeNaN();
      // Float32 means of 9 heights near 900 m: within 1e-3 m.
      else expect(Math.abs(d.values[i] - ref.values[i])).toBeLessThan(1e-3);
    }
  });

  it('brings a 4000 × 3000 window down to at most 1024 cells on its long side', () => {
    const g: DemGrid = {
      file: 'big',
      epsg: 32634,
      cols: 4000,
      rows: 3000,
      x0: 0,
      y0: 0,
      dx: 1,
      dy: 1,
      values: new Float32Array(4000 * 3000),
      nodata: null,
    };
    const d = run(downsampleSteps(g));
    // Factor ceil(4000 / 1024) = 4: 1000 × 750 whole blocks.
    expect([d.cols, d.rows, d.dx]).toEqual([1000, 750, 4]);
  });
});

describe('contour interval', () => {
  it('takes 1, 2 or 5 × 10^k giving 10 to 25 lines', () => {
    // Worked by hand: 812–1377 m spans 565 m: 20 m gives 28 lines, 50 m gives 11 (850 … 1350).
    expect(contourInterval(812, 1377)).toBe(50);
    // 0–100: 5 gives 21 lines (0, 5, …, 100).
    expect(contourInterval(0, 100)).toBe(5);
    // 1000.3–1003.1: 0.2 gives 14 lines (1000.4 … 1003.0); 0.1 would give 28.
    expect(contourInterval(1000.3, 1003.1)).toBe(0.2);
    expect(contourInterval(5, 5)).toBeNaN();
    for (const [lo, hi] of [
      [0, 7],
      [123, 4567],
      [-30, 12],
      [2000, 2013],
    ]) {
      const i = contourInterval(lo, hi);
      const n = Math.floor(hi / i) - Math.ceil(lo / i) + 1;
      expect(n, `${lo}–${hi} at ${i}`).toBeGreaterThanOrEqual(10);
      expect(n).toBeLessThanOrEqual(25);
    }
  });

  it('marks every fifth multiple as an index contour, in feet when shown in feet', () => {
    const { interval, levels } = contourLevels(812, 1377);
    expect(interval).toBe(50);
    expect(levels.filter((l) => l.index).map((l) => l.height_m)).toEqual([1000, 1250]);
    // 812–1377 m is 2664–4518 ft: 100 ft gives 19 lines, index at 3000, 3500, 4000, 4500 ft.
    const ft = contourLevels(812, 1377, 0.3048);
    expect(ft.interval).toBe(100);
    expect(ft.levels.filter((l) => l.index).map((l) => l.shown)).toEqual([3000, 3500, 4000, 4500]);
    expect(ft.levels[0].height_m).toBeCloseTo(2700 * 0.3048, 9);
  });
});

/** A ShadeGrid of heights f(x, y) at cell centres (x east, y north, CRS units). */
function fieldGrid(cols: number, rows: number, cell: number, f: (x: number, y: number) => number) {
  const values = new Float32Array(cols * rows);
  for (let r = 0; r < rows; r++) {
    for (let c = 0; c < cols; c++) values[r * cols + c] = f((c + 0.5) * cell, -(r + 0.5) * cell);
  }
  const g: ShadeGrid = {
    file: 'field',
    epsg: 32634,
    cols,
    rows,
    x0: 0,
    y0: 0,
    dx: cell,
    dy: cell,
    values,
    nodata: null,
  };
  return g;
}

const crsOf = (g: ShadeGrid, xy: Float64Array, i: number) => ({
  x: g.x0 + (xy[2 * i] + 0.5) * g.dx,
  y: g.y0 - (xy[2 * i + 1] + 0.5) * g.dy,
});

describe('contour lines against closed forms', () => {
  it('puts every vertex of a plane’s contours on the line a·x + b·y + c = level', () => {
    // Linear interpolation is exact on a plane; heights are Float32, hence 1e-3 m.
    const a = 0.12;
    const b = -0.05;
    const c = 700;
    const g = fieldGrid(40, 30, 10, (x, y) => a * x + b * y + c);
    const { levels } = contourLevels(680, 760);
    const lines = contours(g, levels);
    expect(lines.length).toBeGreaterThan(5);
    for (const line of lines) {
      // A plane's contour is one straight open line across the grid.
      expect(lines.filter((l) => l.level === line.level)).toHaveLength(1);
      for (let i = 0; i < line.xy.length / 2; i++) {
        const p = crsOf(g, line.xy, i);
        expect(Math.abs(a * p.x + b * p.y + c - line.level.height_m)).toBeLessThan(2e-3);
      }
    }
  });

  it('draws a cone’s contour as one closed ring at radius (peak − level) / slope', () => {
    // Cone z = H − s·r about (cx, cy). Along a cell side, linear interpolation of z misplaces the
    // crossing by at most the chord sag of the circle over one cell: cell² / (8·radius) // common practice
    const H = 1500;
    const s = 0.4;
    const cell = 10;
    const cx = 253;
    const cy = -247;
    const g = fieldGrid(50, 50, cell, (x, y) => H - s * Math.hypot(x - cx, y - cy));
    const levels = [1420, 1450, 1480].map((h) => ({ height_m: h, shown: h, index: false }));
    const lines = contours(g, levels);
    expect(lines).toHaveLength(3);
    for (const line of lines) {
      const n = line.xy.length / 2;
      expect(line.xy[0]).toBe(line.xy[2 * n - 2]);
      expect(line.xy[1]).toBe(line.xy[2 * n - 1]);
      const radius = (H - line.level.height_m) / s;
      const tol = (cell * cell) / (8 * radius) + 1e-2;
      let maxErr = 0;
      for (let i = 0; i < n; i++) {
        const p = crsOf(g, line.xy, i);
        maxErr = Math.max(maxErr, Math.abs(Math.hypot(p.x - cx, p.y - cy) - radius));
      }
      expect(maxErr, `radius ${radius}`).toBeLessThan(tol);
      // A ring of radius R crosses about 4·2R/cell sides (each row and column twice).
      expect(n).toBeGreaterThan((4 * 2 * radius) / cell - 4);
    }
  });

  it('stops a line at unknown heights and never crosses them', () => {
    const g = fieldGrid(20, 20, 10, (x) => x);
    for (let r = 0; r < 20; r++) g.values[r * 20 + 10] = NaN;
    const lines = contours(g, [{ height_m: 105, shown: 105, index: false }]);
    // Column 10 (x = 105) is unknown: the squares either side of it hold no contour at 105.
    expect(lines).toHaveLength(0);
    const left = contours(g, [{ height_m: 52, shown: 52, index: false }]);
    expect(left).toHaveLength(1);
    for (let i = 0; i < left[0].xy.length / 2; i++) expect(left[0].xy[2 * i]).toBeCloseTo(4.7, 9);
  });
});
