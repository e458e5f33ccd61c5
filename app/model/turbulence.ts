import { M_PER_FT, MPS_PER_KT } from './constants';
import type { FallTable } from './fall-table';
import type { TurbulenceClass } from './types';

/**
 * Wind at 20 ft (m/s) that names each intensity class of the low-altitude turbulence model:
 * 15, 30 and 45 kt (MIL-F-8785C / MIL-HDBK-1797 low-altitude model, docs/model.md §8a).
 */
export const CLASS_W20_MPS: Readonly<Record<'light' | 'moderate' | 'severe', number>> =
  Object.freeze({ light: 15 * MPS_PER_KT, moderate: 30 * MPS_PER_KT, severe: 45 * MPS_PER_KT });

/** Height (m above ground) where the standard's reference wind W20 is read: 20 ft. */
export const W20_HEIGHT_M = 20 * M_PER_FT;

/** Intensities (1σ, m/s) and length scales (m) of the turbulence at one height. */
export interface TurbulenceAt {
  /** Horizontal gust per component (σ_u = σ_v at low altitude), m/s. */
  sigmaU_mps: number;
  /** Vertical gust, m/s. */
  sigmaW_mps: number;
  /** Length scale of the horizontal components (L_u = L_v), m. */
  lengthU_m: number;
  /** Length scale of the vertical component, m. */
  lengthW_m: number;
}

/**
 * Low-altitude (below 1000 ft) turbulence of MIL-F-8785C / MIL-HDBK-1797 at height h_m above
 * ground for a wind of w20_mps at 20 ft: σ_w = 0.1·W20, σ_u = σ_v = σ_w/(0.177 + 0.000823 h)^0.4,
 * L_w = h, L_u = L_v = h/(0.177 + 0.000823 h)^1.2, h in feet. The height is held to
 * [10 ft, 1000 ft], the range the forms are given for (docs/model.md §8a).
 */
export function lowAltitudeTurbulence(h_m: number, w20_mps: number): TurbulenceAt {
  const hft = Math.min(1000, Math.max(10, h_m / M_PER_FT));
  const k = 0.177 + 0.000823 * hft;
  const sigmaW = 0.1 * w20_mps;
  return {
    sigmaU_mps: sigmaW / k ** 0.4,
    sigmaW_mps: sigmaW,
    lengthU_m: (hft / k ** 1.2) * M_PER_FT,
    lengthW_m: hft * M_PER_FT,
  };
}

/** W20 (m/s) of a turbulence class; `auto` uses the plan's own wind at 20 ft; `none` is 0. */
export function classW20(turbulence: TurbulenceClass, windAt20ft_mps: number): number {
  if (turbulence === 'none') return 0;
  if (turbulence === 'auto') return windAt20ft_mps;
  return CLASS_W20_MPS[turbulence];
}

/** What one fall's air motion is made of: the modelled intensity and the plan's overrides. */
export interface TurbulenceSpec {
  /** W20 (m/s) for the modelled values; 0 = no modelled turbulence. */
  w20_mps: number;
  /** Set 1σ horizontal gust per component (m/s): replaces the modelled σ_u. */
  gust_mps?: number;
  /** Set correlation time of the gust (s): replaces the modelled L_u / w. */
  gustTime_s?: number;
  /** Set 1σ vertical air velocity, constant through one fall (m/s): replaces the modelled one. */
  verticalAir_mps?: number;
}

/** Variance of the band integrals of a Gauss–Markov process and their covariance with the start. */
interface BandFunctional {
  /** Var Σ_b ∫_band g dt (m²). */
  varA: number;
  /** Cov(Σ_b ∫_band g dt, g(0)) (m²/s). */
  covAB: number;
  /** Var of each band's integral, m². */
  bandVar: Float64Array;
  /** Covariance of the integrals of bands b−1 and b (0 for b = 0), m². */
  adjCov: Float64Array;
}

/**
 * Exact second moments of the integrals over the fall table's bands of a Gauss–Markov process
 * whose σ (m/s) and correlation time τ (s) are constant within each band (docs/model.md §8a):
 * Var ∫_b = σ_b²·2τ_b²(x_b − 1 + e^(−x_b)), x_b = Δt_b/τ_b, and for bands i < j
 * Cov = σ_iσ_j·τ_i(1 − e^(−x_i))·τ_j(1 − e^(−x_j))·e^(−(s_j − s_{i+1})), with s the "eddy clock"
 * ∫dt/τ at each band's top.
 */
function bandFunctional(dt: Float64Array, sigma: Float64Array, tau: Float64Array): BandFunctional {
  const k = dt.length;
  const x = new Float64Array(k);
  const edge = new Float64Array(k); // σ_b τ_b (1 − e^(−x_b))
  const s = new Float64Array(k + 1);
  const bandVar = new Float64Array(k);
  for (let b = 0; b < k; b++) {
    x[b] = dt[b] / tau[b];
    const e = Math.exp(-x[b]);
    // x − 1 + e^(−x) loses every digit for small x: use its series x²/2 − x³/6 + x⁴/24.
    const q = x[b] < 1e-3 ? x[b] * x[b] * (0.5 - x[b] / 6 + (x[b] * x[b]) / 24) : x[b] - 1 + e;
    bandVar[b] = sigma[b] * sigma[b] * 2 * tau[b] * tau[b] * q;
    edge[b] = sigma[b] * tau[b] * -Math.expm1(-x[b]);
    s[b + 1] = s[b] + x[b];
  }
  let varA = 0;
  let covAB = 0;
  const adjCov = new Float64Array(k);
  for (let i = 0; i < k; i++) {
    varA += bandVar[i];
    covAB += sigma[0] * edge[i] * Math.exp(-s[i]);
    for (let j = i + 1; j < k; j++) {
      const c = edge[i] * edge[j] * Math.exp(-(s[j] - s[i + 1]));
      if (j === i + 1) adjCov[j] = c;
      varA += 2 * c;
    }
  }
  return { varA, covAB, bandVar, adjCov };
}

/**
 * Gusts and vertical air of one fall, ready for the Monte Carlo draws (docs/model.md §8a). The
 * gust is a Gauss–Markov process along the fall, per horizontal component; `varA`/`covAB` give its
 * exact aggregated draw (drift integral and value at release), `phi`/`innov` its band-by-band
 * AR(1) draw for homing (band means: each band's variance and each neighbour covariance exact).
 */
export interface FallTurbulence {
  /** Var of the gust drift integral over the nominal fall, m² per component. */
  varA: number;
  /** Cov of the gust drift integral with the gust at release, m²/s. */
  covAB: number;
  /** σ of the gust at release, m/s. */
  sigma0_mps: number;
  /** Band-mean AR(1): g_b = phi_b g_(b−1) + innov_b n_b (phi_0 = 0). */
  phi: Float64Array;
  innov: Float64Array;
  /** 1σ vertical air velocity, constant through one fall, m/s. */
  verticalAir_mps: number;
  /** Mean nominal descent speed of the fall (height / time), m/s. */
  meanDescent_mps: number;
  /** Time-RMS gust σ over the fall and time-mean correlation time, for reports. */
  gust_mps: number;
  gustTime_s: number;
}

/** Air motion of one fall from its table, the height of its landing ground and the spec. */
export function fallTurbulence(
  table: FallTable,
  ground_m: number,
  spec: TurbulenceSpec,
): FallTurbulence {
  const k = table.bandCount;
  const dt = table.bandDt;
  const T = table.fallTime_s;
  const sigU = new Float64Array(k);
  const tauU = new Float64Array(k);
  const sigW = new Float64Array(k);
  const tauW = new Float64Array(k);
  let sumSig2 = 0;
  let sumTau = 0;
  for (let b = 0; b < k; b++) {
    const h = table.bandMid[b] - ground_m;
    const w = table.bandDz[b] / dt[b];
    const m = lowAltitudeTurbulence(h, spec.w20_mps);
    // Taylor's frozen-turbulence hypothesis, as the Dryden forms assume: the vehicle passes the
    // eddies at its descent speed relative to the air, so τ = L / w.
    sigU[b] = spec.gust_mps ?? m.sigmaU_mps;
    tauU[b] = spec.gustTime_s ?? m.lengthU_m / w;
    sigW[b] = m.sigmaW_mps;
    tauW[b] = m.lengthW_m / w;
    sumSig2 += sigU[b] * sigU[b] * dt[b];
    sumTau += tauU[b] * dt[b];
  }
  const g = bandFunctional(dt, sigU, tauU);
  const phi = new Float64Array(k);
  const innov = new Float64Array(k);
  for (let b = 0; b < k; b++) {
    const sd = Math.sqrt(g.bandVar[b]) / dt[b];
    if (b === 0) {
      innov[0] = sd;
      continue;
    }
    const prev = Math.sqrt(g.bandVar[b - 1]) / dt[b - 1];
    const denom = Math.sqrt(g.bandVar[b - 1] * g.bandVar[b]);
    const rho = denom > 0 ? Math.min(1, g.adjCov[b] / denom) : 0;
    phi[b] = prev > 0 ? (rho * sd) / prev : 0;
    innov[b] = sd * Math.sqrt(Math.max(0, 1 - rho * rho));
  }
  // The vertical gust acts through the fall time only; its constant equivalent over this fall is
  // the mean of the process over the fall: σ_a = √Var(∫ w_g dt) / T.
  const vertical =
    spec.verticalAir_mps ??
    (spec.w20_mps > 0 ? Math.sqrt(bandFunctional(dt, sigW, tauW).varA) / T : 0);
  return {
    varA: g.varA,
    covAB: g.covAB,
    sigma0_mps: sigU[0] ?? 0,
    phi,
    innov,
    verticalAir_mps: vertical,
    meanDescent_mps: (table.top_m - table.bottom_m) / T,
    gust_mps: Math.sqrt(sumSig2 / T),
    gustTime_s: sumTau / T,
  };
}
