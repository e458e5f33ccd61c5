/**
 * `--terrain FILE` and the plan's `terrain.file` on the command line: the window read, the
 * results over an inclined plane, the same answers from a GeoTIFF made by GDAL (Debian gdal-bin
 * gdal_translate) as from the ESRI ASCII grid it was made from, each bad file's message, and the
 * reach polygons in the GeoJSON and KML exports.
 */
import { kml as kmlToGeoJSON } from '@tmcw/togeojson';
import { DOMParser } from '@xmldom/xmldom';
import { execFileSync } from 'node:child_process';
import {
  existsSync,
  mkdirSync,
  mkdtempSync,
  readFileSync,
  rmSync,
  statSync,
  writeFileSync,
} from 'node:fs';
import { tmpdir } from 'node:os';
import { join, relative } from 'node:path';
import { XMLValidator } from 'fast-xml-parser';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { loadTerrain, runCli } from '../../app/cli';
import type { Args } from '../../app/cli/args';
import { LocalFrame } from '../../app/model';
import { validatePlan, type Plan } from '../../app/plan';
import { type PlanResult, terrainArea } from '../../app/planner';
import demo from '../../data/demo-plan.json';

const SAMPLES = '60';
const CELL = 0.0005; // degrees
/** Cells of file beyond the plan's area on every side, so the window is smaller than the file. */
const PAD = 40;

let dir: string;
let plan: Plan;
let ascPath: string;
let tifPath: string;
/** The plane: 89 m MSL at the release point, rising 6 m per 100 m east and 3 m per 100 m north. */
let plane: (p: { lat: number; lon: number }) => number;
let grid: { x0: number; y0: number; cols: number; rows: number };

interface Out {
  code: number;
  out: string;
  err: string;
}
async function cli(...argv: string[]): Promise<Out> {
  let out = '';
  let err = '';
  const code = await runCli(argv, {
    out: (t) => void (out += t),
    err: (t) => void (err += t),
  });
  return { code, out, err };
}

function asc(
  g: { x0: number; y0: number; cols: number; rows: number },
  z: (lat: number, lon: number) => number,
): string {
  const lines = [
    `ncols ${g.cols}`,
    `nrows ${g.rows}`,
    `xllcorner ${g.x0}`,
    `yllcorner ${g.y0}`,
    `cellsize ${CELL}`,
    'NODATA_value -9999',
  ];
  for (let r = 0; r < g.rows; r++) {
    const lat = g.y0 + (g.rows - r - 0.5) * CELL;
    const row: string[] = [];
    for (let c = 0; c < g.cols; c++) row.push(z(lat, g.x0 + (c + 0.5) * CELL).toFixed(4));
    lines.push(row.join(' '));
  }
  return `${lines.join('\n')}\n`;
}

const gdal = (args: string[]): string =>
  execFileSync('gdal_translate', ['-q', ...args], { encoding: 'utf8' });

function writePlan(name: string, content: unknown): string {
  const path = join(dir, name);
  mkdirSync(join(path, '..'), { recursive: true });
  writeFileSync(path, typeof content === 'string' ? content : JSON.stringify(content));
  return path;
}

beforeAll(() => {
  dir = mkdtempSync(join(tmpdir(), 'seedfall-cli-terrain-'));
  const v = validatePlan(structuredClone(demo));
  if (!v.ok) throw new Error('demo plan');
  plan = v.plan;
  const frame = new LocalFrame(plan.release);
  plane = (p) => {
    const { x, y } = frame.toLocal(p);
    return 89 + 0.06 * x + 0.03 * y;
  };
  // The heights at cell centres are the plane's exactly (to 0.1 mm), so bilinear sampling between
  // them is the plane to within its own curvature in degrees (far under 1 mm over one cell).
  const box = terrainArea(plan);
  const x0 = Math.floor(box.west / CELL) * CELL - PAD * CELL;
  const y0 = Math.floor(box.south / CELL) * CELL - PAD * CELL;
  grid = {
    x0,
    y0,
    cols: Math.ceil((box.east - x0) / CELL) + PAD,
    rows: Math.ceil((box.north - y0) / CELL) + PAD,
  };
  ascPath = join(dir, 'dem', 'plane.asc');
  mkdirSync(join(dir, 'dem'));
  writeFileSync(
    ascPath,
    asc(grid, (lat, lon) => plane({ lat, lon })),
  );
  tifPath = join(dir, 'dem', 'plane.tif');
  // Striped 16 rows at a time, so a window is a few strips and not the whole file.
  gdal(['-ot', 'Float32', '-a_srs', 'EPSG:4326', '-co', 'BLOCKYSIZE=16', ascPath, tifPath]);
});
afterAll(() => {
  if (dir) rmSync(dir, { recursive: true, force: true });
});

const args = (terrain: string, file = 'data/demo-plan.json'): Args => ({
  command: 'plan',
  file,
  format: 'json',
  paper: 'A4',
  terrain,
});

describe('reading the elevation model for a plan', () => {
  it('reads only the window of terrainArea(plan) from an ASCII grid and a GeoTIFF', async () => {
    const box = terrainArea(plan);
    for (const path of [ascPath, tifPath]) {
      const t = (await loadTerrain(args(path), plan))!;
      expect(t.fileCols).toBe(grid.cols);
      expect(t.fileRows).toBe(grid.rows);
      // The window holds the area (plus the readers' 2-cell margin) and not the 40-cell padding.
      expect(t.window.cols).toBeLessThan(grid.cols - PAD);
      expect(t.window.rows).toBeLessThan(grid.rows - PAD);
      const b = t.dem.bounds();
      expect(b.south).toBeLessThanOrEqual(box.south);
      expect(b.north).toBeGreaterThanOrEqual(box.north);
      expect(b.west).toBeLessThanOrEqual(box.west);
      expect(b.east).toBeGreaterThanOrEqual(box.east);
      // The plane at the release point: 89 m (its definition), bilinear between exact corners.
      expect(Math.abs(t.dem.sample(plan.release)! - 89)).toBeLessThan(1e-3);
    }
    // The GeoTIFF is read by byte ranges: the strips under the window, not the whole file.
    const t = (await loadTerrain(args(tifPath), plan))!;
    expect(t.bytesRead).toBeLessThan(0.8 * statSync(tifPath).size);
  });

  it('resolves the plan file’s relative terrain.file against the plan’s folder; --terrain overrides it', async () => {
    const planPath = writePlan('plans/here/p.json', {
      ...structuredClone(demo),
      terrain: { file: relative(join(dir, 'plans/here'), ascPath) },
    });
    const r = await cli(planPath, '--format', 'json', '--samples', SAMPLES);
    expect(r.err).not.toMatch(/cannot read/);
    expect(r.code).toBe(0);
    const res = JSON.parse(r.out) as PlanResult;
    expect(res.terrain?.name).toBe(join(dir, 'plans/here', '../../dem/plane.asc'));
    const missing = writePlan('plans/missing.json', {
      ...structuredClone(demo),
      terrain: { file: 'nowhere/dem.tif' },
    });
    const bad = await cli(missing, '--format', 'json', '--samples', SAMPLES);
    expect(bad.code).toBe(1);
    expect(bad.err).toBe(
      `seedfall: cannot read elevation model ${join(dir, 'plans/nowhere/dem.tif')} (terrain.file): ENOENT\n`,
    );
    const over = await cli(missing, '--terrain', tifPath, '--format', 'json', '--samples', SAMPLES);
    expect(over.code).toBe(0);
    expect((JSON.parse(over.out) as PlanResult).terrain?.name).toBe(tifPath);
  });
});

describe('an ASCII grid in metres', () => {
  it('is read in the plan’s UTM zone (EPSG:32634 at the demo release), heights where GDAL puts them', async () => {
    // gdaltransform (Debian gdal-bin) projects the area's corners and the release point.
    const box = terrainArea(plan);
    const utm = (pts: [number, number][]): number[][] =>
      execFileSync('gdaltransform', ['-s_srs', 'EPSG:4326', '-t_srs', 'EPSG:32634', '-output_xy'], {
        input: pts.map((p) => p.join(' ')).join('\n') + '\n',
        encoding: 'utf8',
      })
        .trim()
        .split('\n')
        .map((l) => l.trim().split(/\s+/).map(Number));
    const corners = utm([
      [box.west, box.south],
      [box.west, box.north],
      [box.east, box.south],
      [box.east, box.north],
    ]);
    const cell = 30;
    const e0 = Math.floor(Math.min(...corners.map((c) => c[0])) / cell) * cell - 3 * cell;
    const n0 = Math.floor(Math.min(...corners.map((c) => c[1])) / cell) * cell - 3 * cell;
    const cols = Math.ceil((Math.max(...corners.map((c) => c[0])) - e0) / cell) + 3;
    const rows = Math.ceil((Math.max(...corners.map((c) => c[1])) - n0) / cell) + 3;
    const lines = [
      `ncols ${cols}`,
      `nrows ${rows}`,
      `xllcorner ${e0}`,
      `yllcorner ${n0}`,
      `cellsize ${cell}`,
    ];
    // A plane in metres: 100 m at the grid's west edge, rising 1 m per 100 m east.
    for (let r = 0; r < rows; r++) {
      const row: string[] = [];
      for (let c = 0; c < cols; c++) row.push((100 + 0.01 * (c + 0.5) * cell).toFixed(3));
      lines.push(row.join(' '));
    }
    const path = join(dir, 'utm.asc');
    writeFileSync(path, lines.join('\n'));
    const t = (await loadTerrain(args(path), plan))!;
    expect(t.note).toContain('EPSG:32634');
    const [[e]] = utm([[plan.release.lon, plan.release.lat]]);
    expect(Math.abs(t.dem.sample(plan.release)! - (100 + 0.01 * (e - e0)))).toBeLessThan(1e-3);
  });
});

describe('planning over an inclined plane from the command line', () => {
  let fromAsc: PlanResult;
  let fromTif: PlanResult;
  beforeAll(async () => {
    const a = await cli('data/demo-plan.json', '--terrain', ascPath, '--format', 'json');
    const t = await cli('data/demo-plan.json', '--terrain', tifPath, '--format', 'json');
    expect(a.code).toBe(0);
    expect(t.code).toBe(0);
    fromAsc = JSON.parse(a.out) as PlanResult;
    fromTif = JSON.parse(t.out) as PlanResult;
  }, 240_000);

  it('gives every variant its landing ground on the plane and a reach polygon when steered', () => {
    expect(fromAsc.terrain?.name).toBe(ascPath);
    for (const s of fromAsc.sites) {
      expect(s.ground?.source).toBe('typed'); // the demo plan types every site's elevation
      expect(s.byVariant.length).toBe(plan.variants.length);
      for (const v of s.byVariant) {
        expect(v.landingGround_m).not.toBeUndefined();
        expect(v.reachPolygon).not.toBeUndefined();
        // The ground where the nominal descent ends is the plane's height there (closed form).
        expect(Math.abs(v.landingGround_m! - plane(v.nominalLanding))).toBeLessThan(0.01);
        if (v.guidance === 'passive') expect(v.reachPolygon).toBeNull();
        else expect(v.reachPolygon?.type).toBe('Polygon');
      }
    }
  });

  it('gives the same landing grounds from the GeoTIFF as from its ASCII grid, to 1 mm', () => {
    // GDAL gdal_translate wrote the same heights as Float32, which is how both readers keep them.
    let n = 0;
    fromAsc.sites.forEach((s, i) =>
      s.byVariant.forEach((v, k) => {
        const w = fromTif.sites[i].byVariant[k];
        expect(w.variant).toBe(v.variant);
        expect(Math.abs(w.landingGround_m! - v.landingGround_m!)).toBeLessThan(1e-3);
        n++;
      }),
    );
    expect(n).toBe(plan.sites.length * plan.variants.length);
  });

  it('prints the ground per site in the text report', async () => {
    const r = await cli('data/demo-plan.json', '--terrain', ascPath, '--samples', SAMPLES);
    expect(r.code).toBe(0);
    expect(r.out).toContain(`Terrain: ${ascPath}`);
    expect(r.out).toMatch(/site\s+variant\s+site ground m\s+from\s+uncontrolled landing ground m/);
    for (const s of plan.sites)
      expect(r.out).toMatch(new RegExp(`^${s.id}\\s+\\S+\\s+[\\d.]+\\s+typed`, 'm'));
  });
});

describe('the brief and the timeline with an elevation model', () => {
  it('the brief names the model and how much of it was read, and draws a profile per site', async () => {
    const out = join(dir, 'brief.html');
    const r = await cli(
      'brief',
      'data/demo-plan.json',
      '--terrain',
      tifPath,
      '--out',
      out,
      '--samples',
      SAMPLES,
    );
    expect(r.code).toBe(0);
    const html = readFileSync(out, 'utf8');
    expect(html).toContain('<h2>Fall profile over the ground</h2>');
    expect(html).toMatch(/\d+ × \d+ cells read of \d+ × \d+, [\d.]+ MB of [\d.]+ MB/);
    expect(html.match(/<svg class="gprof"/g)).toHaveLength(plan.sites.length);
  });

  it('the timeline flies over the model too, and refuses a model it cannot read', async () => {
    const flat = await cli(
      'timeline',
      'data/demo-plan.json',
      '--samples',
      SAMPLES,
      '--step',
      '1h',
      '--format',
      'json',
    );
    const over = await cli(
      'timeline',
      'data/demo-plan.json',
      '--samples',
      SAMPLES,
      '--step',
      '1h',
      '--format',
      'json',
      '--terrain',
      ascPath,
    );
    expect([flat.code, over.code]).toEqual([0, 0]);
    // On a 6 % / 3 % plane the landings move (the typed site elevations are not the plane's),
    // so some site's P(hit) differs from level ground at some time (common practice: a slope
    // that lifts the ground metres under a 110 m fall changes where it lands).
    const pick = (o: Out) =>
      (JSON.parse(o.out) as { entries: { sites: { pHit: number }[] }[] }).entries.flatMap((e) =>
        e.sites.map((x) => x.pHit),
      );
    expect(pick(over)).toHaveLength(pick(flat).length);
    expect(pick(over)).not.toEqual(pick(flat));
    const p = writePlan('plans/timeline.json', {
      ...structuredClone(demo),
      terrain: { file: 'no-such.tif' },
    });
    const r = await cli('timeline', p, '--samples', '20', '--step', '30m');
    expect(r.code).toBe(1);
    expect(r.err).toMatch(/no-such\.tif/);
  });
});

describe('exports over terrain', () => {
  it('GeoJSON carries each site × steered variant’s reach polygon with closed, counter-clockwise rings', async () => {
    const r = await cli(
      'export',
      'data/demo-plan.json',
      '--terrain',
      ascPath,
      '--format',
      'geojson',
      '--samples',
      SAMPLES,
    );
    expect(r.code).toBe(0);
    const fc = JSON.parse(r.out) as {
      features: {
        geometry: { type: string; coordinates: number[][][] };
        properties: Record<string, unknown>;
      }[];
    };
    const reach = fc.features.filter((f) => f.properties.kind === 'reach');
    const steered = plan.variants.filter((v) => v.guidance !== 'passive').length;
    expect(reach.length).toBe(plan.sites.length * steered);
    for (const f of reach) {
      expect(f.geometry.type).toBe('Polygon');
      expect(typeof f.properties.site).toBe('string');
      expect(typeof f.properties.variant).toBe('string');
      const ring = f.geometry.coordinates[0];
      // RFC 7946 §3.1.6: a linear ring has ≥ 4 positions, the first and last the same;
      // exterior rings counter-clockwise (shoelace area > 0 in lon/lat).
      expect(ring.length).toBeGreaterThanOrEqual(4);
      expect(ring[ring.length - 1]).toEqual(ring[0]);
      let area2 = 0;
      for (let i = 0; i + 1 < ring.length; i++)
        area2 += ring[i][0] * ring[i + 1][1] - ring[i + 1][0] * ring[i][1];
      expect(area2).toBeGreaterThan(0);
    }
    // The chosen variant of each site is marked among them.
    for (const s of plan.sites) {
      const chosen = reach.filter((f) => f.properties.site === s.id && f.properties.chosen);
      expect(chosen.length).toBeLessThanOrEqual(1);
    }
  });

  it('KML carries the same polygons as well-formed KML 2.2 placemarks', async () => {
    const out = join(dir, 'reach.kml');
    const r = await cli(
      'export',
      'data/demo-plan.json',
      '--terrain',
      ascPath,
      '--format',
      'kml',
      '--out',
      out,
      '--samples',
      SAMPLES,
    );
    expect(r.code).toBe(0);
    const text = readFileSync(out, 'utf8');
    expect(XMLValidator.validate(text)).toBe(true); // XML 1.0 well-formedness (fast-xml-parser)
    const back = kmlToGeoJSON(
      new DOMParser().parseFromString(text, 'text/xml') as unknown as Document,
    );
    const reach = back.features.filter((f) => f.properties?.kind === 'reach');
    const steered = plan.variants.filter((v) => v.guidance !== 'passive').length;
    expect(reach.length).toBe(plan.sites.length * steered);
    expect(reach.every((f) => f.geometry?.type === 'Polygon')).toBe(true);
  });
});

describe('a bad elevation model', () => {
  const cases: [string, () => string, RegExp][] = [
    [
      'a missing file',
      () => join(dir, 'no-such.asc'),
      /cannot read elevation model .*no-such\.asc \(--terrain\): ENOENT$/,
    ],
    [
      'a corrupt TIFF',
      () => {
        const p = join(dir, 'junk.tif');
        writeFileSync(p, Buffer.from(Array.from({ length: 5000 }, (_, i) => (i * 73 + 11) & 0xff)));
        return p;
      },
      /junk\.tif: not a readable GeoTIFF/,
    ],
    [
      'a truncated TIFF',
      () => {
        const p = join(dir, 'cut.tif');
        const b = readFileSync(tifPath);
        writeFileSync(p, b.subarray(0, Math.floor(b.length / 3)));
        return p;
      },
      /cut\.tif: .*truncated/,
    ],
    [
      'a two-band TIFF',
      () => {
        const p = join(dir, 'two.tif');
        gdal(['-b', '1', '-b', '1', tifPath, p]);
        return p;
      },
      /two\.tif: it has 2 bands/,
    ],
    [
      'a TIFF in a CRS it does not support',
      () => {
        const p = join(dir, 'osgb.tif');
        gdal(['-a_srs', 'EPSG:27700', tifPath, p]);
        return p;
      },
      /osgb\.tif: its CRS EPSG:27700 is not supported/,
    ],
    [
      'an ASCII grid with a wrong header',
      () => {
        const p = join(dir, 'header.asc');
        writeFileSync(p, readFileSync(ascPath, 'utf8').replace('cellsize', 'cellsise'));
        return p;
      },
      /header\.asc: line 5: unknown header key 'cellsise'/,
    ],
    [
      'a grid far from the plan',
      () => {
        const p = join(dir, 'far.asc');
        writeFileSync(
          p,
          asc({ ...grid, x0: grid.x0 + 5, cols: 50, rows: 50 }, () => 100),
        );
        return p;
      },
      /far\.asc: .*(does not cover|covers only part|away)/,
    ],
  ];

  for (const [what, make, message] of cases) {
    it(`${what}: one line naming the file, exit 1, nothing written`, async () => {
      const file = make();
      const out = join(dir, `out-${what.replace(/\W+/g, '-')}.geojson`);
      const r = await cli(
        'export',
        'data/demo-plan.json',
        '--terrain',
        file,
        '--out',
        out,
        '--samples',
        SAMPLES,
      );
      expect(r.code).toBe(1);
      expect(r.out).toBe('');
      expect(r.err.split('\n').filter(Boolean)).toHaveLength(1);
      expect(r.err).toMatch(/^seedfall: /);
      expect(r.err.trim()).toMatch(message);
      expect(existsSync(out)).toBe(false);
    });
  }

  it('refuses a file that is neither .tif/.tiff nor .asc before reading anything', async () => {
    const r = await cli('data/demo-plan.json', '--terrain', 'dem.png');
    expect(r.code).toBe(1);
    expect(r.err).toBe(
      'seedfall: --terrain must name a .tif, .tiff or .asc file (got "dem.png")\n',
    );
  });
});
