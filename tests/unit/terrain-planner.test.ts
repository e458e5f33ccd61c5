/**
 * The planner over terrain (docs/model.md §18), each against something worked outside it: an
 * inclined plane against the closed-form intersection and against an independent integral of
 * the density-scaled descent, a cone hill's reach against its closed form, a flat model against
 * the planner on flat ground, a ridge that hides a site, and models that do not cover the plan.
 */
import { readFileSync } from 'node:fs';
import { describe, expect, it } from 'vitest';
import { Dem } from '../../app/formats/dem';
import {
  type ElevationModel,
  groundCrossing,
  type LatLon,
  linePath,
  LocalFrame,
  sampledGround,
} from '../../app/model';
import type { PlanFile } from '../../app/plan/plan';
import { validatePlan } from '../../app/plan/validate';
import {
  planDrop,
  type PlanResult,
  terrainArea,
  type SiteResult,
  type VariantResult,
} from '../../app/planner';
import { NOW, RELEASE, expectClose, expectNearLatLng, offsetLatLng } from './helpers';

const DEG = Math.PI / 180;
/** Planning over a model under full load on 2 cores: generous, never a timing check. */
const SLOW = 120_000;

/** A plan from a file, validated (throws with the problems). */
function resolve(file: PlanFile) {
  const v = validatePlan(file, { now: NOW });
  if (!v.ok) throw new Error(JSON.stringify(v.errors));
  return v.plan;
}

/**
 * An analytic elevation model: h(x, y) in a local frame about `origin` (x east, y north, m);
 * the planner gets it sampled on a grid of `cell_m` in its own frame, bilinear between cells,
 * as it gets a DEM.
 */
function analytic(
  name: string,
  origin: LatLon,
  h: (x: number, y: number) => number | null,
  cell_m: number,
): ElevationModel {
  const mine = new LocalFrame(origin);
  const at = (p: LatLon) => {
    const q = mine.toLocal(p);
    return h(q.x, q.y);
  };
  return {
    name,
    sample: at,
    localGround: (frame, box) => sampledGround((x, y) => at(frame.toLatLon(x, y)), box, cell_m),
  };
}

/** A WGS 84 grid (EPSG:4326) over a box, heights from f(lat, lon) at the cell centres. */
function geoDem(
  file: string,
  box: { south: number; west: number; north: number; east: number },
  cols: number,
  rows: number,
  f: (lat: number, lon: number) => number,
  nodata: number | null = null,
): Dem {
  const dx = (box.east - box.west) / cols;
  const dy = (box.north - box.south) / rows;
  const values = new Float32Array(cols * rows);
  for (let r = 0; r < rows; r++) {
    for (let c = 0; c < cols; c++) {
      values[r * cols + c] = f(box.north - (r + 0.5) * dy, box.west + (c + 0.5) * dx);
    }
  }
  return new Dem({
    file,
    epsg: 4326,
    cols,
    rows,
    x0: box.west,
    y0: box.north,
    dx,
    dy,
    values,
    nodata,
  });
}

/** A box grown by `pad` degrees on every side. */
const grow = (b: { south: number; west: number; north: number; east: number }, pad: number) => ({
  south: b.south - pad,
  west: b.west - pad,
  north: b.north + pad,
  east: b.east + pad,
});

/** Wind towards (east, north), m/s, of a layer blowing from `fromDeg` at `speed` (§2). */
const windVec = (fromDeg: number, speed: number) => ({
  u: -speed * Math.sin(fromDeg * DEG),
  v: -speed * Math.cos(fromDeg * DEG),
});

// ---- U.S. Standard Atmosphere 1976, troposphere, written from the standard ----
// Constants of the standard (COESA 1976, Table 2 and §1.2): R* = 8.31432 J/(mol·K),
// M0 = 0.0289644 kg/mol, g0 = 9.80665 m/s², r0 = 6356766 m, L = −0.0065 K/m,
// T0 = 288.15 K, P0 = 101325 Pa; geopotential H = r0·z/(r0 + z); in a layer of constant lapse
// rate P = P0·(T0/T)^(g0·M0/(R*·L)) with T = T0 + L·H; ρ = P·M0/(R*·T).
const R_STAR = 8.31432;
const M0 = 0.0289644;
const G0 = 9.80665;
const R0 = 6356766;
const LAPSE = -0.0065;
function ussaDensityAtGeopotential(H: number): number {
  const T = 288.15 + LAPSE * H;
  const P = 101325 * Math.pow(288.15 / T, (G0 * M0) / (R_STAR * LAPSE));
  return (P * M0) / (R_STAR * T);
}
const ussaDensity = (z: number) => ussaDensityAtGeopotential((R0 * z) / (R0 + z));

/** ∫_a^b f by the composite Simpson rule with n (even) intervals (Abramowitz & Stegun 25.4.6). */
function simpson(f: (x: number) => number, a: number, b: number, n = 400): number {
  const h = (b - a) / n;
  let s = f(a) + f(b);
  for (let i = 1; i < n; i++) s += (i % 2 ? 4 : 2) * f(a + i * h);
  return (s * h) / 3;
}

describe('the test atmosphere is the standard', () => {
  it('gives the U.S. Standard Atmosphere 1976 table densities', () => {
    const fx = JSON.parse(
      readFileSync(new URL('../fixtures/atmosphere/ussa1976.json', import.meta.url), 'utf8'),
    ) as { rows: { H: number; rho: number }[] };
    // Fixture: U.S. Standard Atmosphere 1976 (COESA), to half a unit of the last printed digit.
    for (const row of fx.rows) {
      const digits = row.rho === 1.225 ? 3 : 5;
      expectClose(
        ussaDensityAtGeopotential(row.H),
        row.rho,
        0.5 * 10 ** -digits,
        `ρ at ${row.H} m`,
      );
    }
  });
});

describe('a descent on an inclined plane in a uniform wind', () => {
  it('meets a gridded plane at the closed-form point (constant descent speed)', () => {
    // z(t) = z0 − w·t, (x, y)(t) = (x0, y0) + (u, v)·t meets z = c + a·x + b·y at
    // t* = (z0 − c − a·x0 − b·y0)/(w + a·u + b·v) (direct algebra). Bilinear sampling
    // reproduces a plane, so the grid adds no error (docs/model.md §18).
    const box = { xMin: -2000, xMax: 2000, yMin: -2000, yMax: 2000 };
    for (const [a, b, u, v, w] of [
      [0.2, -0.1, 6, -2, 3],
      [-0.25, 0.05, 4, 3, 2.5],
      [0.3, 0.3, -4, -4, 4],
    ]) {
      const c = 400;
      const ground = sampledGround((x, y) => c + a * x + b * y, box, 7);
      const [x0, y0, z0] = [-120, 35, 700];
      const cross = groundCrossing(ground, linePath({ x: x0, y: y0, z: z0 }, u / w, v / w, -500));
      const t = (z0 - c - a * x0 - b * y0) / (w + a * u + b * v);
      expect(cross.kind).toBe('ground');
      // 1 cm: the search closes to 1 mm of altitude, moved sideways by at most |u|/w.
      expectClose(cross.x, x0 + u * t, 0.01, `x on slope ${a}, ${b}`);
      expectClose(cross.y, y0 + v * t, 0.01, `y on slope ${a}, ${b}`);
      expectClose(cross.z, z0 - w * t, 0.01, `z on slope ${a}, ${b}`);
    }
  });

  it(
    'lands through planDrop where the density-scaled descent meets the plane (independent integral)',
    () => {
      // A 20 % by 10 % slope rising to the north-east, the plan ground 500 m at the release point.
      const [a, b, c] = [0.2, 0.1, 500];
      const model = analytic('plane.asc', RELEASE, (x, y) => c + a * x + b * y, 5);
      const wind = { fromDeg: 250, speed_mps: 5 };
      const plan = resolve({
        format: 'seedfall-plan',
        version: 1,
        name: 'plane',
        time: NOW.toISOString(),
        groundElevation_m: 500,
        atmosphere: { isaOffset_K: 0 },
        release: { lat: RELEASE.lat, lon: RELEASE.lon, altitude_m: 120, reference: 'AGL' },
        carrier: { groundSpeed_mps: 0, trackDeg: 0 },
        // One layer at the plan ground: below it W = W(z1) when h1 ≤ 0, above it the top layer
        // holds (docs/model.md §2), so the wind is uniform over the whole fall.
        winds: { reference: 'AGL', layers: [{ altitude_m: 0, ...wind }] },
        // throwTime_s 0: no forward throw (docs/model.md §4), the descent is drift alone.
        variants: [{ id: 'drifter', guidance: 'passive', descentRate_mps: 3, throwTime_s: 0 }],
        // The plane is at 500 + 0.2·250 + 0.1·90 = 559 m at the site; typed 4 m lower (within the
        // 5 m notice), the release is placed for a fall to 555 m, which the plane cuts short.
        sites: [{ id: 'slope', elevation_m: 555, ...offsetLatLng(RELEASE, 250, 90) }],
        uncertainty: {
          windSpeed_mps: 0,
          windCorrelation_m: 1,
          descentRate_pct: 0,
          releasePosition_m: 0,
          heading_deg: 0,
          releaseTiming_s: 0,
          turbulence: 'none',
        },
        monteCarlo: { samples: 50, seed: 1 },
      });
      const result = planDrop(plan, { terrain: model });
      const site = result.sites[0];
      const vr = site.byVariant[0];
      expect(site.ground).toEqual({
        elevation_m: 555,
        source: 'typed',
        terrain_m: expect.any(Number),
      });
      expectClose(site.ground!.terrain_m!, 559, 1e-3, 'model at the site');
      // Independent flight from the reported release point and altitude: t(z) = ∫_z^z0 dz′/w(z′),
      // w = w_SL·√(ρ0/ρ(z)) (docs/model.md §3, momentum theory), ρ from the standard above,
      // ρ0 = 1.225 kg/m³ (the standard's sea-level density); drift = wind × time.
      const frame = new LocalFrame(RELEASE);
      const r = frame.toLocal(vr.release);
      const z0 = result.releaseAltitudeMSL_m;
      const { u, v } = windVec(wind.fromDeg, wind.speed_mps);
      const invW = (z: number) => 1 / (3 * Math.sqrt(1.225 / ussaDensity(z)));
      const timeTo = (z: number) => simpson(invW, z, z0);
      const gap = (z: number) => {
        const t = timeTo(z);
        return z - (c + a * (r.x + u * t) + b * (r.y + v * t));
      };
      // Bisection on the gap (positive at the release, negative 400 m lower): 60 halvings.
      let hi = z0;
      let lo = z0 - 400;
      expect(gap(hi)).toBeGreaterThan(0);
      expect(gap(lo)).toBeLessThan(0);
      for (let i = 0; i < 60; i++) {
        const m = (hi + lo) / 2;
        if (gap(m) > 0) hi = m;
        else lo = m;
      }
      const zStar = (hi + lo) / 2;
      const tStar = timeTo(zStar);
      const landing = frame.toLatLon(r.x + u * tStar, r.y + v * tStar);
      expectNearLatLng(vr.nominalLanding, landing, 0.01, 'nominal landing');
      expectClose(vr.landingGround_m as number, zStar, 0.01, 'ground at the landing');
      expectClose(vr.fallTime_s, tStar, 0.001, 'fall time');
      // The plane matters here: the fall to the typed 555 m would end some 4.8 m farther on, so the
      // checks above could not pass on a level-ground answer.
      const tFlat = timeTo(555);
      expect((tFlat - tStar) * wind.speed_mps).toBeGreaterThan(3);
      expect(vr.nominalMiss_m).toBeGreaterThan(3);
    },
    SLOW,
  );
});

describe('a cone hill', () => {
  it(
    'gives reach polygon radii per ray that match the closed form',
    () => {
      // Cone h = B + max(0, H − s·|P − C|) east of the release, calm air, hovering.
      const [B, H, s] = [300, 60, 0.3];
      const C = { x: 150, y: 60 };
      const cell = 2;
      const cone = (x: number, y: number) => B + Math.max(0, H - s * Math.hypot(x - C.x, y - C.y));
      const model = analytic('cone.asc', RELEASE, cone, cell);
      const glide = 45;
      const plan = resolve({
        format: 'seedfall-plan',
        version: 1,
        name: 'cone',
        time: NOW.toISOString(),
        groundElevation_m: B,
        release: { lat: RELEASE.lat, lon: RELEASE.lon, altitude_m: 150, reference: 'AGL' },
        carrier: { groundSpeed_mps: 0, trackDeg: 0 },
        winds: { reference: 'AGL', layers: [] },
        variants: [
          {
            id: 'seeker',
            guidance: 'homing',
            descentRate_mps: 3,
            glideAngle_deg: glide,
            controlTime_s: 300,
            entryLoss_m: 10,
          },
        ],
        sites: [{ id: 'c1', elevation_m: B, ...offsetLatLng(RELEASE, -60, -40) }],
        uncertainty: {
          windSpeed_mps: 0,
          windCorrelation_m: 1,
          descentRate_pct: 0,
          releasePosition_m: 0,
          heading_deg: 0,
          releaseTiming_s: 0,
          turbulence: 'none',
        },
        monteCarlo: { samples: 50, seed: 1 },
      });
      const result = planDrop(plan, { terrain: model });
      const vr = result.sites[0].byVariant[0];
      const poly = vr.reachPolygon;
      expect(poly).not.toBeNull();
      const ring = poly!.coordinates[0];
      expect(ring.length - 1).toBeGreaterThanOrEqual(72);
      // Steering starts at the entry end z_e = z_top − entryLoss straight under the release
      // (calm, hovering: no drift, no throw) and glides k = cot γ metres per metre lost; a ray of
      // unit direction û meets the cone where z_e − ρ/k = B + H − s·|ρû − C|, i.e.
      // s²(ρ² − 2ρ(û·C) + |C|²) = (ρ/k − (z_e − B − H))² (docs/model.md §18, direct algebra):
      // the smallest root ρ ≥ 0 with ρ/k ≥ z_e − B − H, or ρ = k·(z_e − B) off the cone.
      const frame = new LocalFrame(RELEASE);
      const S = frame.toLocal(vr.release);
      const k = 1 / Math.tan(glide * DEG);
      const ze = result.releaseAltitudeMSL_m - 10;
      const Cr = { x: C.x - S.x, y: C.y - S.y };
      const radius = (ux: number, uy: number): number => {
        const d = ze - B - H;
        // (s² − 1/k²)ρ² + (2d/k − 2s²(û·C))ρ + s²|C|² − d² = 0
        const uc = ux * Cr.x + uy * Cr.y;
        const A = s * s - 1 / (k * k);
        const Bq = (2 * d) / k - 2 * s * s * uc;
        const Cq = s * s * (Cr.x * Cr.x + Cr.y * Cr.y) - d * d;
        const disc = Bq * Bq - 4 * A * Cq;
        const off = k * (ze - B);
        if (disc < 0) return off;
        const roots = [(-Bq - Math.sqrt(disc)) / (2 * A), (-Bq + Math.sqrt(disc)) / (2 * A)]
          .filter((rho) => rho >= 0 && rho / k >= d && rho <= off)
          .sort((p, q) => p - q);
        return roots.length ? roots[0] : off;
      };
      // Tolerance: the planner sees the cone bilinear between cell centres; at a kink (apex, foot)
      // that is off by at most s·cell·√2/2 in height, and a height error δh moves the crossing
      // by δh / |d(gap)/dρ| with |d(gap)/dρ| ≥ 1/k − s sideways; plus 1 cm for the search.
      const tol = (s * cell * Math.SQRT1_2) / (1 / k - s) + 0.01;
      let onCone = 0;
      for (const [lon, lat] of ring.slice(0, -1)) {
        const p = frame.toLocal({ lat, lon });
        const dx = p.x - S.x;
        const dy = p.y - S.y;
        const rho = Math.hypot(dx, dy);
        const expected = radius(dx / rho, dy / rho);
        if (expected < k * (ze - B) - 1e-6) onCone++;
        expectClose(rho, expected, tol, `ray towards ${(Math.atan2(dx, dy) / DEG).toFixed(1)}°`);
      }
      // The hill matters: a good share of the rays meet it.
      expect(onCone).toBeGreaterThanOrEqual(10);
    },
    SLOW,
  );
});

// ---- The demo plan over a flat model, a ridge, and models that miss the plan ----

const demoFile = JSON.parse(
  readFileSync(new URL('../../data/demo-plan.json', import.meta.url), 'utf8'),
) as PlanFile;
/** The demo plan with every site typed at the plan ground (89 m). */
const flatFile: PlanFile = {
  ...demoFile,
  sites: demoFile.sites.map((s) => ({ ...s, elevation_m: demoFile.groundElevation_m })),
};
const flatPlan = resolve(flatFile);
const area = terrainArea(flatPlan);
const flatDem = geoDem('flat-89.asc', grow(area, 0.002), 120, 120, () => 89);

/** Every number of a variant's result that must not change on level ground, by name. */
function comparable(vr: VariantResult) {
  const e = (x: VariantResult['ellipse50']) => [
    x.center.lat,
    x.center.lon,
    x.semiMajor_m,
    x.semiMinor_m,
    x.azimuth_deg,
  ];
  return {
    nominalLanding: [vr.nominalLanding.lat, vr.nominalLanding.lon],
    meanLanding: [vr.meanLanding.lat, vr.meanLanding.lon],
    release: [vr.release.lat, vr.release.lon, vr.release.time_s],
    ellipse50: e(vr.ellipse50),
    ellipse95: e(vr.ellipse95),
    ellipse99: e(vr.ellipse99),
    window: vr.releaseWindow
      ? [vr.releaseWindow.open_s, vr.releaseWindow.close_s, vr.releaseWindow.best_s]
      : null,
    zone: vr.releaseZone ? [vr.releaseZone.radius_m] : null,
    pHit: [vr.pHit],
    cep: [vr.cep_m],
    fallTime: [vr.fallTime_s],
  };
}

describe('a flat elevation model', () => {
  it(
    'gives the answers of level ground to the millimetre, for every site and variant',
    () => {
      const flat = planDrop(flatPlan);
      const over = planDrop(flatPlan, { terrain: flatDem });
      // Level ground at the sites' own elevation is what the planner flies without a model: the
      // same numbers are the check (docs/model.md §18, "on flat ground the first step is exact").
      const degToM = 111_320; // metres per degree of latitude, and an upper bound for longitude
      expect(over.sites.length).toBe(12);
      for (let i = 0; i < flat.sites.length; i++) {
        expect(over.sites[i].byVariant.length).toBe(flat.sites[i].byVariant.length);
        for (let j = 0; j < flat.sites[i].byVariant.length; j++) {
          const a = comparable(flat.sites[i].byVariant[j]);
          const b = comparable(over.sites[i].byVariant[j]);
          const what = `${flat.sites[i].id} ${flat.sites[i].byVariant[j].variant}`;
          for (const key of Object.keys(a) as (keyof typeof a)[]) {
            const x = a[key];
            const y = b[key];
            if (x === null || y === null) {
              expect(y, `${what} ${key}`).toEqual(x);
              continue;
            }
            x.forEach((xv, n) => {
              // lat/lon pairs in degrees: 1 mm is 1e-3/111320 degrees.
              const isDeg = ['nominalLanding', 'meanLanding', 'release'].includes(key)
                ? n < 2
                : key.startsWith('ellipse') && n < 2;
              const tol = isDeg ? 1e-3 / degToM : key === 'pHit' ? 0 : 1e-3;
              expectClose(y[n], xv, tol, `${what} ${key}[${n}]`);
            });
          }
          expectClose(over.sites[i].byVariant[j].landingGround_m as number, 89, 1e-3, what);
          expect(over.sites[i].byVariant[j].terrain?.offTerrain).toBe(0);
        }
        const g = over.sites[i].ground!;
        expect([g.elevation_m, g.source]).toEqual([89, 'typed']);
        expectClose(g.terrain_m!, 89, 1e-9, 'model height at the site (bilinear of 89s)');
        expect(over.sites[i].recommended).toBe(flat.sites[i].recommended);
      }
      expect(over.terrain?.name).toBe('flat-89.asc');
    },
    SLOW,
  );

  it(
    'gives sites without a typed elevation the model height, and a notice for a typed one > 5 m off',
    () => {
      const file: PlanFile = {
        ...flatFile,
        sites: flatFile.sites.map((s, i) => {
          if (i === 0) {
            const untyped = { ...s };
            delete untyped.elevation_m; // from the model
            return untyped;
          }
          if (i === 1) return { ...s, elevation_m: 95.5 }; // 6.5 m above the model: a notice
          if (i === 2) return { ...s, elevation_m: 93 }; // 4 m: within 5 m, no notice
          return s;
        }),
      };
      const result = planDrop(resolve(file), { terrain: flatDem });
      const [s1, s2, s3] = result.sites;
      expect(s1.ground).toEqual({ elevation_m: 89, source: 'terrain', terrain_m: 89 });
      expect(s2.ground).toEqual({ elevation_m: 95.5, source: 'typed', terrain_m: 89 });
      expect(s3.ground?.source).toBe('typed');
      const about = (id: string) => result.warnings.filter((w) => w.includes(id));
      expect(about(s2.id).length).toBe(1);
      expect(about(s2.id)[0]).toMatch(/6\.5 m/);
      expect(about(s3.id)).toEqual([]);
      expect(about(s1.id)).toEqual([]);
    },
    SLOW,
  );

  it('refuses a model whose ground at an untyped site is not below the release, naming both', () => {
    // The demo's release is 110 m above its 89 m plan ground, 199 m MSL: ground at 250 m under
    // a site without a typed elevation cannot be flown to (direct comparison).
    const file: PlanFile = {
      ...flatFile,
      sites: flatFile.sites.map((s, i) => {
        const copy = { ...s };
        if (i === 0) delete copy.elevation_m;
        return copy;
      }),
    };
    const high = geoDem('high-250.asc', grow(area, 0.002), 120, 120, () => 250);
    expect(() => planDrop(resolve(file), { terrain: high })).toThrow(
      /high-250\.asc: the ground at site \S+ is 250 m MSL, not below the release altitude/,
    );
  });
});

describe('a ridge between the release and a site', () => {
  it(
    'hides the site: reported with the ridge, not reachable, and a warning names it',
    () => {
      // Wind 6 m/s from the west, descent 3 m/s: the passive fall drifts 2 m east per metre lost,
      // so from 150 m above level ground it lands ~300 m downwind. A ridge 100 m high across the
      // track 150 m east of the release is met at about 150 − 150/2 = 75 m above the ground.
      const ridge = (x: number) => 100 * Math.exp(-(((x - 150) / 15) ** 2));
      const model = analytic('ridge.asc', RELEASE, (x) => 200 + ridge(x), 2);
      const plan = resolve({
        format: 'seedfall-plan',
        version: 1,
        name: 'ridge',
        time: NOW.toISOString(),
        groundElevation_m: 200,
        release: { lat: RELEASE.lat, lon: RELEASE.lon, altitude_m: 150, reference: 'AGL' },
        carrier: { groundSpeed_mps: 0, trackDeg: 0 },
        winds: { reference: 'AGL', layers: [{ altitude_m: 0, fromDeg: 270, speed_mps: 6 }] },
        variants: [{ id: 'drifter', guidance: 'passive', descentRate_mps: 3 }],
        sites: [{ id: 'behind', name: 'Lee hollow', ...offsetLatLng(RELEASE, 300, 0) }],
        monteCarlo: { samples: 200, seed: 1 },
      });
      const result = planDrop(plan, { terrain: model });
      const site = result.sites[0];
      const vr = site.byVariant[0];
      const hidden = vr.terrain?.hiddenBy;
      expect(hidden).toBeDefined();
      // The obstacle lies on the ridge's upwind face: between its foot and its crest in height,
      // and about the ridge's distance from the site (300 − 150 m, give or take its width).
      expect(hidden!.aboveSite_m).toBeGreaterThan(30);
      expect(hidden!.aboveSite_m).toBeLessThanOrEqual(100.5);
      expect(hidden!.fromSite_m).toBeGreaterThan(110);
      expect(hidden!.fromSite_m).toBeLessThan(200);
      expectClose(hidden!.ground_m, 200 + hidden!.aboveSite_m, 0.5, 'obstacle ground');
      expect(vr.reachable).toBe(false);
      expect(site.meetsRequired).toBe(false);
      expect(result.warnings.some((w) => w.includes('behind') && /hidden|ridge/i.test(w))).toBe(
        true,
      );
    },
    SLOW,
  );
});

describe('a model that does not serve the plan', () => {
  it(
    'refuses a model that does not cover the plan area, naming the model',
    () => {
      const away = geoDem('far-away.asc', grow(area, 0.002), 60, 60, () => 89);
      // Shift it one degree north: it no longer covers the plan's area.
      const g = away.grid;
      const shifted = new Dem({ ...g, file: 'far-away.asc', y0: g.y0 + 1 });
      expect(() => planDrop(flatPlan, { terrain: shifted })).toThrow(/far-away\.asc/);
      // Covering only the western half of the area falls short too.
      const half = geoDem(
        'west-half.asc',
        { ...grow(area, 0.002), east: (area.west + area.east) / 2 },
        60,
        60,
        () => 89,
      );
      expect(() => planDrop(flatPlan, { terrain: half })).toThrow(/west-half\.asc/);
    },
    SLOW,
  );

  it(
    'counts descents that meet no known ground as misses, with a warning (never flat ground)',
    () => {
      // A hole of nodata 120 m around site s06, inside an otherwise flat model.
      const s6 = flatPlan.sites[5];
      const frame = new LocalFrame(s6);
      const NODATA = -9999;
      const holed = geoDem(
        'holed.asc',
        grow(area, 0.002),
        240,
        240,
        (lat, lon) => {
          const q = frame.toLocal({ lat, lon });
          return Math.hypot(q.x, q.y) < 120 ? NODATA : 89;
        },
        NODATA,
      );
      const flat = planDrop(flatPlan);
      const result = planDrop(flatPlan, { terrain: holed });
      const site = result.sites[5];
      const onFlat = flat.sites[5];
      for (const vr of site.byVariant) {
        const t = vr.terrain!;
        // Every sample of this fall lands near the site, inside the hole.
        expect(t.offTerrain).toBeGreaterThan(0.9);
        expect(vr.pHit).toBeLessThanOrEqual(1 - t.offTerrain + 1e-12);
      }
      expect(Math.max(...onFlat.byVariant.map((v) => v.pHit))).toBeGreaterThan(0.5);
      expect(site.meetsRequired).toBe(false);
      expect(result.warnings.some((w) => w.includes(s6.id))).toBe(true);
      // A steered glide into the hole leaves the reach area unknown: not reachable, with a
      // warning, never the level-ground circle.
      for (const vr of site.byVariant.filter((v) => v.guidance !== 'passive')) {
        expect(vr.reachPolygon).toBeNull();
        expect(vr.reachable).toBe(false);
      }
      const unknown = result.warnings.find((w) => w.startsWith('reach area not known'));
      expect(unknown).toContain(s6.id);
      // A site away from the hole is untouched.
      const far = result.sites.find((s) => s.id === 's11') as SiteResult;
      expect(far.byVariant.every((v) => v.terrain?.offTerrain === 0)).toBe(true);
      const plain: PlanResult = flat;
      expect(plain.terrain).toBeUndefined();
    },
    SLOW,
  );
});
