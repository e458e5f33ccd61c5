import { G0 } from './constants';
import type { FallTable } from './fall-table';
import type { Guidance, Uncertainty } from './types';
import type { Rng } from './rng';
import type { FallTurbulence } from './turbulence';

const DEG = Math.PI / 180;

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
 */
export function flySamples(s: FlightSetup, req: SampleRequest, xs: Float64Array, ys: Float64Array) {
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
      }
    }
    xs[i] = px;
    ys[i] = py;
  }
}
