import { G0 } from './constants';
import type { FallTable } from './fall-table';
import type { Guidance, Uncertainty } from './types';
import type { Rng } from './rng';
import {
  CROSS_GROUND,
  fastCrossing,
  firstCrossing,
  type PathAt,
  type TerrainGround,
} from './terrain';
import type { FallTurbulence } from './turbulence';

const DEG = Math.PI / 180;

/** Altitude tolerance of a Monte Carlo sample's ground crossing, m (some cm sideways; the nominal flight uses 1 mm). */
const SAMPLE_TOL_M = 0.05;

/** East/north vector in the planner's local frame, m or m/s. */
export interface Vec {
  x: number;
  y: number;
}

/** Everything one variant's flight needs besides the random draws (docs/model.md §4–6). */
export interface FlightSetup {
  table: FallTable;
  guidance: Guidance;
  /** cot γ of the full-authority glide (0 for passive). */
  cotGamma: number;
  /** Thrust budget after the entry, s. */
  controlTime_s: number;
  /** Fixed forward-throw time, s; undefined = relaxation time τ = w/g. */
  throwTime_s?: number;
  /** Carrier ground velocity, m/s (x east, y north). */
  carrier: Vec;
  /** Forecast wind at the release altitude, m/s. */
  windTop: Vec;
  /** Gusts and vertical air of this fall (`fallTurbulence`); absent = still air. */
  turbulence?: FallTurbulence;
  /** Ground to land on (docs/model.md §18); absent = level ground at the table's bottom. */
  terrain?: FlightTerrain;
}

/** The ground a fall ends on, and the fall continued below the table's bottom. */
export interface FlightTerrain {
  ground: TerrainGround;
  /** The nominal fall from the table's bottom down to `bottom_m`; null when no ground is lower. */
  below: FallTable | null;
  /** Lowest altitude a descent is followed to, m MSL. */
  bottom_m: number;
  /** A bound of the ground's slope over the whole area (m per m; Infinity when unknown). */
  maxSlope?: number;
}

/**
 * Cumulative nominal time and drift by altitude on an even grid (for the terrain search): from
 * the table's top to its bottom in n1 steps, then through `below` in n2 steps. The values at the
 * table's bottom are the table's own totals, so a descent met there lands where the level-ground
 * flight does.
 */
export class AltitudePath {
  readonly top_m: number;
  readonly mid_m: number;
  readonly low_m: number;
  /** grid step (m) and node count from the top to the table's bottom */
  readonly h1: number;
  readonly n1: number;
  private readonly h2: number;
  private readonly n2: number;
  /** time, east and north drift at the grid nodes, from the top down */
  readonly t: Float64Array;
  readonly e: Float64Array;
  readonly n: Float64Array;

  constructor(table: FallTable, below: FallTable | null) {
    this.top_m = table.top_m;
    this.mid_m = table.bottom_m;
    this.low_m = below ? below.bottom_m : table.bottom_m;
    this.n1 = Math.max(1, Math.ceil((this.top_m - this.mid_m) / 0.5));
    this.h1 = (this.top_m - this.mid_m) / this.n1;
    this.n2 = below ? Math.max(1, Math.ceil((this.mid_m - this.low_m) / 0.5)) : 0;
    this.h2 = this.n2 > 0 ? (this.mid_m - this.low_m) / this.n2 : 1;
    const m = this.n1 + this.n2 + 1;
    this.t = new Float64Array(m);
    this.e = new Float64Array(m);
    this.n = new Float64Array(m);
    const fill = (tab: FallTable, i0: number, count: number, h: number, base: number[]) => {
      // Walk the table's nodes alongside the even grid (both descend).
      let j = 0;
      const zs = tab.z;
      const last = zs.length - 1;
      for (let i = 0; i <= count; i++) {
        const z = tab.top_m - i * h;
        let t: number;
        let e: number;
        let nn: number;
        if (i === count) {
          [t, e, nn] = [tab.t[last], tab.dEast[last], tab.dNorth[last]];
        } else {
          while (j < last - 1 && zs[j + 1] >= z) j++;
          const f = zs[j] === zs[j + 1] ? 0 : (zs[j] - z) / (zs[j] - zs[j + 1]);
          t = tab.t[j] + f * (tab.t[j + 1] - tab.t[j]);
          e = tab.dEast[j] + f * (tab.dEast[j + 1] - tab.dEast[j]);
          nn = tab.dNorth[j] + f * (tab.dNorth[j + 1] - tab.dNorth[j]);
        }
        this.t[i0 + i] = base[0] + t;
        this.e[i0 + i] = base[1] + e;
        this.n[i0 + i] = base[2] + nn;
      }
    };
    fill(table, 0, this.n1, this.h1, [0, 0, 0]);
    if (below) {
      const k = this.n1;
      fill(below, k, this.n2, this.h2, [this.t[k], this.e[k], this.n[k]]);
    }
    // Steepest drift and time per metre of altitude between grid nodes (linear between them).
    let d = 0;
    let t = 0;
    for (let i = 1; i < m; i++) {
      const dz = i <= this.n1 ? this.h1 : this.h2;
      d = Math.max(d, Math.hypot(this.e[i] - this.e[i - 1], this.n[i] - this.n[i - 1]) / dz);
      t = Math.max(t, (this.t[i] - this.t[i - 1]) / dz);
    }
    this.driftRate = d;
    this.timeRate = t;
  }

  /** Largest nominal drift (m) and time (s) per metre of altitude along the grid. */
  readonly driftRate: number;
  readonly timeRate: number;

  /** Fractional grid index of altitude z (clamped to the grid). */
  index(z: number): number {
    if (z >= this.mid_m) return Math.max(0, (this.top_m - z) / this.h1);
    return Math.min(this.n1 + this.n2, this.n1 + (this.mid_m - z) / this.h2);
  }
}

// One altitude path per fall table (probes reuse it).
const pathCache = new WeakMap<FallTable, AltitudePath>();

/** The AltitudePath of a setup with terrain (cached per fall table). */
export function altitudePath(s: FlightSetup): AltitudePath {
  let p = pathCache.get(s.table);
  if (!p) pathCache.set(s.table, (p = new AltitudePath(s.table, s.terrain?.below ?? null)));
  return p;
}

/** Linear interpolation of a grid array at a fractional index. */
function lerpAt(a: Float64Array, f: number): number {
  const i = Math.min(Math.floor(f), a.length - 2);
  if (i < 0) return a[0];
  return a[i] + (f - i) * (a[i + 1] - a[i]);
}

/**
 * The nominal descent (descent factor 1, no error) from `release` as a PathAt: forward throw,
 * drift, and a steering displacement `steer(z)` (m, by altitude; default none).
 */
export function nominalPath(s: FlightSetup, release: Vec, steer?: (z_m: number) => Vec): PathAt {
  const path = altitudePath(s);
  const th = forwardThrow(s);
  const bx = release.x + th.x;
  const by = release.y + th.y;
  return (z, out) => {
    const f = path.index(z);
    const d = steer ? steer(z) : { x: 0, y: 0 };
    out[0] = bx + lerpAt(path.e, f) + d.x;
    out[1] = by + lerpAt(path.n, f) + d.y;
  };
}

/** Nominal time (s) from release to altitude z along a setup's AltitudePath. */
export function pathTimeAt(s: FlightSetup, z_m: number): number {
  const path = altitudePath(s);
  return lerpAt(path.t, path.index(z_m));
}

/** Open-loop programme of a fixed-heading vehicle. */
export interface Programme {
  headingTrue_deg: number;
  thrust_s: number;
}

/** Forward throw (m): the carrier's air-relative velocity kept for τ = w/g (or a set time). */
export function forwardThrow(s: FlightSetup, f = 1, windErr: Vec = { x: 0, y: 0 }): Vec {
  const tau = s.throwTime_s ?? (f * s.table.wTop_mps) / G0;
  return {
    x: (s.carrier.x - s.windTop.x - windErr.x) * tau,
    y: (s.carrier.y - s.windTop.y - windErr.y) * tau,
  };
}

/** Uncontrolled landing relative to the release point (m): throw plus layered drift. */
export function passiveOffset(s: FlightSetup): Vec {
  const th = forwardThrow(s);
  const d = s.table.drift;
  return { x: th.x + d.east_m, y: th.y + d.north_m };
}

/** Reach radius (m): cot γ times the altitude lost while steering at full authority. */
export function reachRadius(s: FlightSetup): number {
  if (s.guidance === 'passive' || s.cotGamma <= 0) return 0;
  return s.cotGamma * s.table.steeredDrop(s.controlTime_s);
}

/**
 * Fixed-heading programme that moves the landing by `need` (m) in the forecast wind: heading
 * along `need`, thrust until cot γ × altitude lost equals |need| (capped at the budget).
 */
export function fixedHeadingProgramme(s: FlightSetup, need: Vec): Programme {
  const dist = Math.hypot(need.x, need.y);
  const heading = dist > 0 ? (Math.atan2(need.x, need.y) / DEG + 360) % 360 : 0;
  if (dist === 0 || s.cotGamma <= 0) return { headingTrue_deg: heading, thrust_s: 0 };
  const maxDrop = s.table.steeredDrop(s.controlTime_s);
  const drop = Math.min(maxDrop, dist / s.cotGamma);
  const thrust = s.table.timeAt(s.table.entryEnd_m - drop) - s.table.entryTime_s;
  return { headingTrue_deg: heading, thrust_s: Math.min(s.controlTime_s, thrust) };
}

/** Random draws of the wind error for the aggregated (open-loop) flights, per unit σ. */
interface WindFunctional {
  /** σ of A = Σ ε_k Δt_k (m per m/s of wind σ). */
  sdA: number;
  /** Correlation of A with the release-altitude error ε_0. */
  rhoAB: number;
  /** AR(1) coefficients between consecutive bands (correlation of neighbouring band values). */
  arRho: Float64Array;
}

// One functional per fall table and correlation height: probes reuse it.
const functionalCache = new WeakMap<FallTable, Map<number, WindFunctional>>();

function windFunctional(table: FallTable, corr_m: number): WindFunctional {
  let byCorr = functionalCache.get(table);
  if (!byCorr) functionalCache.set(table, (byCorr = new Map()));
  const hit = byCorr.get(corr_m);
  if (hit) return hit;
  const wf = computeWindFunctional(table, corr_m);
  byCorr.set(corr_m, wf);
  return wf;
}

function computeWindFunctional(table: FallTable, corr_m: number): WindFunctional {
  const k = table.bandCount;
  const dt = table.bandDt;
  const z = table.bandMid;
  let varA = 0;
  let covAB = 0;
  for (let i = 0; i < k; i++) {
    covAB += dt[i] * Math.exp(-Math.abs(z[0] - z[i]) / corr_m);
    for (let j = 0; j < k; j++) varA += dt[i] * dt[j] * Math.exp(-Math.abs(z[i] - z[j]) / corr_m);
  }
  const sdA = Math.sqrt(Math.max(0, varA));
  const arRho = new Float64Array(k);
  for (let i = 1; i < k; i++) {
    arRho[i] = Math.exp(-Math.abs(z[i - 1] - z[i]) / corr_m);
  }
  return { sdA, rhoAB: sdA > 0 ? covAB / sdA : 0, arRho };
}

const NO_AR = { arPhi: new Float64Array(0), arInn: new Float64Array(0) };

/**
 * AR(1) coefficients of forecast error plus gust over the bands: x_b = φ_b x_(b−1) + s_b n_b
 * with band variance V_b = σ_w² + V_g,b and neighbour covariance C_b = σ_w² ρ_b + C_g,b, so
 * φ_b = C_b / V_(b−1) and s_b = √(V_b − φ_b C_b). Without gust this is the exact AR(1) of the
 * forecast error alone; with gust, farther correlations are products of neighbour ones.
 */
function combinedAR(
  wf: WindFunctional,
  sw: number,
  turb: FallTurbulence | undefined,
  k: number,
): { arPhi: Float64Array; arInn: Float64Array } {
  const arPhi = new Float64Array(k);
  const arInn = new Float64Array(k);
  let prevVar = 0;
  let prevG = 0;
  for (let b = 0; b < k; b++) {
    // Gust band-mean σ from its own AR(1): σ_g,b² = φ_g,b² σ_g,(b−1)² + innov_b².
    const gPhi = turb ? turb.phi[b] : 0;
    const gInn = turb ? turb.innov[b] : 0;
    const gVar = gPhi * gPhi * prevG + gInn * gInn;
    const v = sw * sw + gVar;
    if (b > 0) {
      const c = sw * sw * wf.arRho[b] + gPhi * prevG;
      const phi = prevVar > 0 ? c / prevVar : 0;
      arPhi[b] = phi;
      arInn[b] = Math.sqrt(Math.max(0, v - phi * c));
    } else {
      arInn[0] = Math.sqrt(v);
    }
    prevVar = v;
    prevG = gVar;
  }
  return { arPhi, arInn };
}

let workArray: Float64Array = new Float64Array(256);
const NO_WORK: Float64Array = new Float64Array(0);

/** What the module's sample path functions read: set by flySamples before it uses them. */
const FP = {
  path: null as AltitudePath | null,
  tRef: 1,
  entryEnd: 0,
  cot: 0,
  k: 0,
  ss: NO_WORK,
  hx: NO_WORK,
  hy: NO_WORK,
  zb: NO_WORK,
};

/** An open-loop sample's descent by altitude (see flySamples): drift, spread error, steering. */
function openPathAt(z: number, out: Float64Array): void {
  const p = FP.path as AltitudePath;
  const ss = FP.ss;
  const fi = p.index(z);
  const r = lerpAt(p.t, fi) / FP.tRef;
  let x = ss[0] + (lerpAt(p.e, fi) + ss[2] * r) * ss[4];
  let y = ss[1] + (lerpAt(p.n, fi) + ss[3] * r) * ss[4];
  const drop = ss[5];
  if (drop > 0) {
    const d = FP.cot * Math.min(drop, Math.max(0, FP.entryEnd - z));
    x += d * ss[6];
    y += d * ss[7];
  }
  out[0] = x;
  out[1] = y;
}

/** A homing sample's descent: the line through its band ends, then on below the table's bottom. */
function homingPathAt(z: number, out: Float64Array): void {
  const { zb, hx, hy, ss } = FP;
  const k = FP.k;
  if (z <= zb[k]) {
    const p = FP.path as AltitudePath;
    const fi = p.index(z);
    const m = p.index(zb[k]);
    const dt = lerpAt(p.t, fi) - lerpAt(p.t, m);
    out[0] = hx[k] + (lerpAt(p.e, fi) - lerpAt(p.e, m) + ss[8] * dt) * ss[4];
    out[1] = hy[k] + (lerpAt(p.n, fi) - lerpAt(p.n, m) + ss[9] * dt) * ss[4];
    return;
  }
  let lo = 0;
  let hi = k;
  while (hi - lo > 1) {
    const mid = (lo + hi) >> 1;
    if (zb[mid] >= z) lo = mid;
    else hi = mid;
  }
  const f = zb[lo] === zb[hi] ? 0 : (zb[lo] - z) / (zb[lo] - zb[hi]);
  out[0] = hx[lo] + f * (hx[hi] - hx[lo]);
  out[1] = hy[lo] + f * (hy[hi] - hy[lo]);
}

/** The shared work array of flySamples, grown to at least n. */
function workBuffer(n: number): Float64Array {
  if (workArray.length < n) workArray = new Float64Array(Math.max(n, 2 * workArray.length));
  return workArray;
}

/** Where and how a batch of samples is released. */
export interface SampleRequest {
  n: number;
  rng: Rng;
  uncertainty: Uncertainty;
  /** Nominal release point in the local frame, m. */
  release: Vec;
  /** Unit vector of the carrier track (release timing error moves along it). */
  trackUnit: Vec;
  groundSpeed_mps: number;
  /** Site in the local frame (homing aims at it), m. */
  site: Vec;
  /** Fixed-heading programme (required for that guidance). */
  programme?: Programme;
}

/**
 * Flies n Monte Carlo samples (docs/model.md §8, §8a) and writes landing points (local frame, m)
 * into xs/ys. Passive and fixed-heading flights are linear in the wind error and the gust, so
 * their whole effect is drawn exactly as two correlated normals per axis (the drift integral and
 * the value at release; forecast error and gust are independent, so their moments add); homing
 * reacts to both, so they are drawn band by band as AR(1) series. Vertical air, constant through
 * a fall, changes the net descent speed and so every time and drift (factor 1/f_eff).
 *
 * Over terrain (`s.terrain`) each sample's descent is followed by altitude to where it meets the
 * ground (fastCrossing, else the firstCrossing walk; docs/model.md §18): open-loop samples by their drift, with their wind
 * error spread over the fall in proportion to time (exact at the table's bottom) and their
 * programme's steering by altitude; homing samples along the line through their band ends; below
 * the table's bottom both continue through `terrain.below` with their last error. A sample that
 * meets no known ground lands at NaN (a miss). Returns the number of such samples.
 */
export function flySamples(
  s: FlightSetup,
  req: SampleRequest,
  xs: Float64Array,
  ys: Float64Array,
): number {
  const { rng, uncertainty: u, release, trackUnit, groundSpeed_mps: v } = req;
  const tab = s.table;
  const wf = windFunctional(tab, Math.max(1e-6, u.windCorrelation_m));
  const sw = u.windSpeed_mps;
  const sf = u.descentRate_pct / 100;
  const sp = u.releasePosition_m;
  const st = u.releaseTiming_s;
  const sh = u.heading_deg * DEG;
  const turb = s.turbulence;
  // Vertical air as a change of the descent factor: f·w(z) − a ≈ w(z)(f − a/w̄), exact when w is
  // uniform over the fall (docs/model.md §8a).
  const aScale = turb && turb.meanDescent_mps > 0 ? turb.verticalAir_mps / turb.meanDescent_mps : 0;
  const drift = tab.drift;
  const tauFixed = s.throwTime_s;
  const g = G0;
  const wTop = tab.wTop_mps;
  const airX = s.carrier.x - s.windTop.x;
  const airY = s.carrier.y - s.windTop.y;
  // Forecast error and gust together: Var A, Cov(A, B), Var B per axis, and their 2×2 Cholesky.
  const varA = sw * sw * wf.sdA * wf.sdA + (turb?.varA ?? 0);
  const covAB = sw * sw * wf.sdA * wf.rhoAB + (turb?.covAB ?? 0);
  const varB = sw * sw + (turb ? turb.sigma0_mps * turb.sigma0_mps : 0);
  const cA = Math.sqrt(Math.max(0, varA));
  const cB1 = cA > 0 ? covAB / cA : 0;
  const cB2 = Math.sqrt(Math.max(0, varB - cB1 * cB1));
  const prog = req.programme ?? { headingTrue_deg: 0, thrust_s: 0 };
  const hdg = prog.headingTrue_deg * DEG;
  const homing = s.guidance === 'homing';
  const fixed = s.guidance === 'fixed-heading';
  const k = tab.bandCount;
  const { bandDt, bandDz, bandEast, bandNorth, bandRemEast, bandRemNorth, bandControl } = tab;
  // Homing: forecast error (point values) and gust (band means) as one AR(1) series per axis
  // whose band variances and neighbour covariances are the sums of the two (docs/model.md §8a).
  const { arPhi, arInn } = homing ? combinedAR(wf, sw, turb, k) : NO_AR;
  const sx = req.site.x;
  const sy = req.site.y;
  const cot = s.cotGamma;
  const budget0 = s.controlTime_s;

  // Terrain: the module's path functions read the per-call state set here (no allocation).
  const ter = s.terrain;
  const path = ter ? altitudePath(s) : null;
  const tRef = tab.fallTime_s;
  const entryEnd = tab.entryEnd_m;
  let cross = NO_WORK;
  let rise = NO_WORK;
  let ss = NO_WORK;
  let hx = NO_WORK;
  let hy = NO_WORK;
  let invDz2 = NO_WORK;
  if (ter && path) {
    // Work arrays from one module-level buffer (flySamples does not nest).
    const work = workBuffer(16 + 4 * (k + 1));
    cross = work.subarray(0, 4);
    rise = work.subarray(4, 6);
    // Per-sample state: 0,1 position after the throw; 2,3 wind-error displacement at the
    // table's bottom; 4 1/f; 5 programme's steered drop; 6,7 its heading unit; 8,9 homing's
    // last band error.
    ss = work.subarray(6, 16);
    // Homing: band-end positions (index b = top of band b; k = the table's bottom).
    hx = work.subarray(16, 16 + (k + 1));
    hy = work.subarray(16 + (k + 1), 16 + 2 * (k + 1));
    const zb = work.subarray(16 + 2 * (k + 1), 16 + 3 * (k + 1));
    invDz2 = work.subarray(16 + 3 * (k + 1), 16 + 4 * (k + 1));
    zb[0] = tab.top_m;
    for (let b = 0; b < k; b++) zb[b + 1] = zb[b] - bandDz[b];
    zb[k] = tab.bottom_m;
    for (let b = 0; b < k; b++) invDz2[b] = 1 / (bandDz[b] * bandDz[b]);
    FP.path = path;
    FP.tRef = tRef;
    FP.entryEnd = entryEnd;
    FP.cot = cot;
    FP.k = k;
    FP.ss = ss;
    FP.hx = hx;
    FP.hy = hy;
    FP.zb = zb;
  }
  let off = 0;

  for (let i = 0; i < req.n; i++) {
    const f = Math.max(0.2, 1 + sf * rng.normal());
    const dtRel = st * rng.normal();
    let px = release.x + sp * rng.normal() + trackUnit.x * v * dtRel;
    let py = release.y + sp * rng.normal() + trackUnit.y * v * dtRel;
    const dh = sh * rng.normal();
    // Net descent never below a fifth of nominal (a sample held in a thermal lands far anyway).
    const fE = aScale > 0 ? Math.max(0.2, f - aScale * rng.normal()) : f;
    const invF = 1 / fE;
    const tau = tauFixed ?? (f * wTop) / g;
    if (!homing) {
      const n1 = rng.normal();
      const n2 = rng.normal();
      const n3 = rng.normal();
      const n4 = rng.normal();
      const ax = cA * n1;
      const bx = cB1 * n1 + cB2 * n2;
      const ay = cA * n3;
      const by = cB1 * n3 + cB2 * n4;
      if (ter) {
        ss[0] = px + (airX - bx) * tau;
        ss[1] = py + (airY - by) * tau;
        ss[2] = ax;
        ss[3] = ay;
        ss[4] = invF;
        ss[5] = fixed && prog.thrust_s > 0 ? tab.steeredDrop(prog.thrust_s, fE) : 0;
        ss[6] = Math.sin(hdg + dh);
        ss[7] = Math.cos(hdg + dh);
      }
      px += (airX - bx) * tau + (drift.east_m + ax) * invF;
      py += (airY - by) * tau + (drift.north_m + ay) * invF;
      if (fixed && prog.thrust_s > 0) {
        const reach = s.cotGamma * tab.steeredDrop(prog.thrust_s, fE);
        px += reach * Math.sin(hdg + dh);
        py += reach * Math.cos(hdg + dh);
      }
    } else {
      const cd = Math.cos(dh);
      const sd = Math.sin(dh);
      let wx = 0;
      let wy = 0;
      let budget = budget0;
      for (let b = 0; b < k; b++) {
        const rho = arPhi[b];
        const inn = arInn[b];
        wx = rho * wx + inn * rng.normal();
        wy = rho * wy + inn * rng.normal();
        if (b === 0) {
          px += (airX - wx) * tau;
          py += (airY - wy) * tau;
          if (ter) {
            hx[0] = px;
            hy[0] = py;
          }
        }
        const dt = bandDt[b];
        if (budget > 0 && bandControl[b] === 1) {
          const dtReal = dt * invF;
          const full = cot * bandDz[b];
          const cap = budget >= dtReal ? full : (full * budget) / dtReal;
          const rx = sx - px - bandRemEast[b] * invF;
          const ry = sy - py - bandRemNorth[b] * invF;
          const dist = Math.sqrt(rx * rx + ry * ry);
          if (dist > 1e-9 && full > 0) {
            const use = dist < cap ? dist : cap;
            budget -= (use / full) * dtReal;
            const q = use / dist;
            const ux = rx * q;
            const uy = ry * q;
            // Heading error rotates the steering vector clockwise by dh.
            px += ux * cd + uy * sd;
            py += -ux * sd + uy * cd;
          }
        }
        px += (bandEast[b] + wx * dt) * invF;
        py += (bandNorth[b] + wy * dt) * invF;
        if (ter) {
          hx[b + 1] = px;
          hy[b + 1] = py;
        }
      }
      if (ter) {
        ss[8] = wx;
        ss[9] = wy;
        ss[4] = invF;
      }
    }
    if (ter) {
      const p = path as AltitudePath;
      const at = homing ? homingPathAt : openPathAt;
      // Sideways metres per metre of altitude this descent can move (fastCrossing's V).
      let v: number;
      if (homing) {
        let v2 = 0;
        for (let b = 0; b < k; b++) {
          const ex = hx[b + 1] - hx[b];
          const ey = hy[b + 1] - hy[b];
          const q = (ex * ex + ey * ey) * invDz2[b];
          if (q > v2) v2 = q;
        }
        const e = Math.sqrt(ss[8] * ss[8] + ss[9] * ss[9]);
        v = Math.max(Math.sqrt(v2), (p.driftRate + e * p.timeRate) * ss[4]);
      } else {
        const a = Math.sqrt(ss[2] * ss[2] + ss[3] * ss[3]);
        v = (p.driftRate + (a * p.timeRate) / tRef) * ss[4];
        if (ss[5] > 0) v += cot;
      }
      // How the descent moves sideways per metre of altitude just above the site's level (for
      // the shortcut's Newton step), when it is known without another path evaluation.
      let riseOk = true;
      if (homing) {
        rise[0] = (hx[k - 1] - hx[k]) / bandDz[k - 1];
        rise[1] = (hy[k - 1] - hy[k]) / bandDz[k - 1];
      } else if (ss[5] > 0 && entryEnd - tab.bottom_m <= ss[5]) {
        riseOk = false; // still steering at the site's level
      } else {
        const rt = (p.t[p.n1 - 1] - p.t[p.n1]) / p.h1 / tRef;
        rise[0] = ((p.e[p.n1 - 1] - p.e[p.n1]) / p.h1 + ss[2] * rt) * ss[4];
        rise[1] = ((p.n[p.n1 - 1] - p.n[p.n1]) / p.h1 + ss[3] * rt) * ss[4];
      }
      let kind = fastCrossing(
        ter.ground,
        at,
        tab.bottom_m,
        px,
        py,
        tab.top_m,
        ter.bottom_m,
        v,
        cross,
        SAMPLE_TOL_M,
        riseOk ? rise : null,
        ter.maxSlope,
      );
      if (kind < 0) {
        kind = firstCrossing(ter.ground, at, tab.top_m, ter.bottom_m, cross, 5, SAMPLE_TOL_M);
      }
      if (kind === CROSS_GROUND) {
        px = cross[0];
        py = cross[1];
      } else {
        px = NaN;
        py = NaN;
        off++;
      }
    }
    xs[i] = px;
    ys[i] = py;
  }
  return off;
}
