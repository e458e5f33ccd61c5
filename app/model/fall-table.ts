import { densityAt } from './atmosphere';
import { RHO0 } from './constants';
import type { WindProfile, WindVector } from './wind';

/** What a fall table needs: one variant falling from one release altitude to one ground. */
export interface FallTableInput {
  /** Release altitude, m MSL. */
  top_m: number;
  /** Ground at the landing site, m MSL (below top_m). */
  bottom_m: number;
  /** Descent speed at sea-level ISA density for the flown mass, m/s. */
  descentRateSL_mps: number;
  /** Altitude lost after release before steering can start, m. */
  entryLoss_m: number;
  isaOffset_K: number;
  /** Air density (kg/m³) at altitude m MSL; default the ISA with isaOffset_K. */
  density?: (z_m: number) => number;
  wind: WindProfile;
  /** Largest integration cell, m (default 1). */
  cell_m?: number;
  /** Largest Monte Carlo band, m (default: fall height / 24, at least 2 m). */
  band_m?: number;
}

/**
 * Most integration cells and Monte Carlo bands one table may hold. The plan schema bounds a fall
 * to 10,500 m (release ≤ 10,000 m, ground ≥ −500 m) in 1 m cells plus at most 200 wind layers and
 * 48 bands, so planned tables stay far below these; a caller asking for more gets a RangeError
 * instead of an allocation that grows with height / cell.
 */
export const MAX_FALL_CELLS = 200_000;
export const MAX_FALL_BANDS = 1_000;

// Gauss–Legendre 3-point nodes and weights on [−1, 1] (Abramowitz & Stegun, Table 25.4).
const GL_X = [-Math.sqrt(3 / 5), 0, Math.sqrt(3 / 5)];
const GL_W = [5 / 9, 8 / 9, 5 / 9];

/**
 * Nominal fall of one variant through one wind profile, tabulated from the release altitude down
 * to the ground (docs/model.md §3): cumulative time t(z) = ∫ dz / w(z) and drift
 * D(z) = ∫ wind(z) / w(z) dz, with w(z) = w_SL·√(ρ0/ρ(z)). Integrated cell by cell with
 * 3-point Gauss–Legendre; cells end at every wind layer, so the integrand is smooth inside each.
 * Arrays run from the top (index 0) down. A descent-rate factor f scales every time and drift by
 * 1/f, so one table serves all Monte Carlo samples.
 *
 * The Monte Carlo bands group the cells into at most a few dozen altitude bands; the entry's end
 * is always a band boundary. Per band: nominal time, drift, mid altitude and remaining drift.
 */
export class FallTable {
  readonly top_m: number;
  readonly bottom_m: number;
  /** Altitude (m MSL) where steering may start. */
  readonly entryEnd_m: number;
  /** Node altitudes, m MSL, descending. */
  readonly z: Float64Array;
  /** Cumulative nominal time from release, s. */
  readonly t: Float64Array;
  /** Cumulative nominal drift from release, east and north, m. */
  readonly dEast: Float64Array;
  readonly dNorth: Float64Array;
  /** Descent speed at the release altitude, m/s. */
  readonly wTop_mps: number;
  /** Nominal time to reach the entry end, s. */
  readonly entryTime_s: number;

  // Monte Carlo bands (descending). bandTop/bandBottom are node indices.
  readonly bandCount: number;
  readonly bandDt: Float64Array;
  readonly bandDz: Float64Array;
  readonly bandEast: Float64Array;
  readonly bandNorth: Float64Array;
  readonly bandMid: Float64Array;
  /** Nominal drift from a band's top to the ground, east and north, m. */
  readonly bandRemEast: Float64Array;
  readonly bandRemNorth: Float64Array;
  /** 1 where the band lies below the entry end (steering allowed), else 0. */
  readonly bandControl: Uint8Array;

  constructor(input: FallTableInput) {
    const { top_m, bottom_m, wind } = input;
    if (!(top_m > bottom_m)) {
      throw new RangeError(
        `release altitude ${top_m} m MSL must be above the ground ${bottom_m} m MSL`,
      );
    }
    if (!(input.descentRateSL_mps > 0 && Number.isFinite(input.descentRateSL_mps))) {
      throw new RangeError(`descent rate ${input.descentRateSL_mps} m/s must be a positive number`);
    }
    const cell = input.cell_m ?? 1;
    const height = top_m - bottom_m;
    const bandH = input.band_m ?? Math.max(2, height / 24);
    if (!(height / cell <= MAX_FALL_CELLS) || !(height / bandH <= MAX_FALL_BANDS)) {
      throw new RangeError(
        `a ${height} m fall in ${cell} m cells and ${bandH} m bands exceeds ` +
          `${MAX_FALL_CELLS} cells or ${MAX_FALL_BANDS} bands`,
      );
    }
    this.top_m = top_m;
    this.bottom_m = bottom_m;
    this.entryEnd_m = Math.max(bottom_m, top_m - Math.max(0, input.entryLoss_m));
    const density = input.density ?? ((z: number) => densityAt(z, input.isaOffset_K));
    const rate = (z: number): number => input.descentRateSL_mps * Math.sqrt(RHO0 / density(z));
    this.wTop_mps = rate(top_m);

    // Band boundaries: entry region and control region each split evenly.
    const bounds: number[] = [top_m];
    const split = (from: number, to: number): void => {
      const n = Math.max(1, Math.ceil((from - to) / bandH - 1e-9));
      for (let i = 1; i <= n; i++) bounds.push(i === n ? to : from - ((from - to) * i) / n);
    };
    if (this.entryEnd_m < top_m) split(top_m, this.entryEnd_m);
    if (this.entryEnd_m > bottom_m) split(this.entryEnd_m, bottom_m);

    // Cells: each band split at wind breakpoints and into pieces of at most `cell` metres.
    const nodes: number[] = [top_m];
    const bandNode: number[] = [0];
    const kinks = wind.breakpoints().filter((k) => k > bottom_m && k < top_m);
    for (let b = 1; b < bounds.length; b++) {
      const hi = bounds[b - 1];
      const lo = bounds[b];
      const stops = [hi, ...kinks.filter((k) => k < hi && k > lo).sort((x, y) => y - x), lo];
      for (let s = 1; s < stops.length; s++) {
        const n = Math.max(1, Math.ceil((stops[s - 1] - stops[s]) / cell - 1e-9));
        for (let i = 1; i <= n; i++) {
          nodes.push(i === n ? stops[s] : stops[s - 1] - ((stops[s - 1] - stops[s]) * i) / n);
        }
      }
      bandNode.push(nodes.length - 1);
    }

    const m = nodes.length;
    this.z = Float64Array.from(nodes);
    this.t = new Float64Array(m);
    this.dEast = new Float64Array(m);
    this.dNorth = new Float64Array(m);
    const w: WindVector = { east_mps: 0, north_mps: 0 };
    for (let i = 1; i < m; i++) {
      const hi = nodes[i - 1];
      const lo = nodes[i];
      const half = (hi - lo) / 2;
      const mid = (hi + lo) / 2;
      let dt = 0;
      let de = 0;
      let dn = 0;
      for (let g = 0; g < 3; g++) {
        const zq = mid + GL_X[g] * half;
        const inv = (GL_W[g] * half) / rate(zq);
        wind.sample(zq, w);
        dt += inv;
        de += w.east_mps * inv;
        dn += w.north_mps * inv;
      }
      this.t[i] = this.t[i - 1] + dt;
      this.dEast[i] = this.dEast[i - 1] + de;
      this.dNorth[i] = this.dNorth[i - 1] + dn;
    }
    this.entryTime_s = this.timeAt(this.entryEnd_m);

    const k = bandNode.length - 1;
    this.bandCount = k;
    this.bandDt = new Float64Array(k);
    this.bandDz = new Float64Array(k);
    this.bandEast = new Float64Array(k);
    this.bandNorth = new Float64Array(k);
    this.bandMid = new Float64Array(k);
    this.bandRemEast = new Float64Array(k);
    this.bandRemNorth = new Float64Array(k);
    this.bandControl = new Uint8Array(k);
    const last = m - 1;
    for (let b = 0; b < k; b++) {
      const i0 = bandNode[b];
      const i1 = bandNode[b + 1];
      this.bandDt[b] = this.t[i1] - this.t[i0];
      this.bandDz[b] = nodes[i0] - nodes[i1];
      this.bandEast[b] = this.dEast[i1] - this.dEast[i0];
      this.bandNorth[b] = this.dNorth[i1] - this.dNorth[i0];
      this.bandMid[b] = (nodes[i0] + nodes[i1]) / 2;
      this.bandRemEast[b] = this.dEast[last] - this.dEast[i0];
      this.bandRemNorth[b] = this.dNorth[last] - this.dNorth[i0];
      this.bandControl[b] = nodes[i0] <= this.entryEnd_m + 1e-9 ? 1 : 0;
    }
  }

  /** Nominal time from release to the ground, s. */
  get fallTime_s(): number {
    return this.t[this.t.length - 1];
  }

  /** Nominal drift from release to the ground (east, north), m. */
  get drift(): { east_m: number; north_m: number } {
    const n = this.t.length - 1;
    return { east_m: this.dEast[n], north_m: this.dNorth[n] };
  }

  /** Nominal time (s) from release to altitude z_m (MSL), clamped to the table. */
  timeAt(z_m: number): number {
    const zs = this.z;
    const n = zs.length;
    if (z_m >= zs[0]) return 0;
    if (z_m <= zs[n - 1]) return this.t[n - 1];
    let lo = 0;
    let hi = n - 1;
    while (hi - lo > 1) {
      const mid = (lo + hi) >> 1;
      if (zs[mid] >= z_m) lo = mid;
      else hi = mid;
    }
    const f = (zs[lo] - z_m) / (zs[lo] - zs[hi]);
    return this.t[lo] + f * (this.t[hi] - this.t[lo]);
  }

  /** Altitude (m MSL) reached at nominal time t_s after release, clamped to the ground. */
  altitudeAt(t_s: number): number {
    const ts = this.t;
    const n = ts.length;
    if (t_s <= 0) return this.z[0];
    if (t_s >= ts[n - 1]) return this.z[n - 1];
    let lo = 0;
    let hi = n - 1;
    while (hi - lo > 1) {
      const mid = (lo + hi) >> 1;
      if (ts[mid] <= t_s) lo = mid;
      else hi = mid;
    }
    const f = (t_s - ts[lo]) / (ts[hi] - ts[lo]);
    return this.z[lo] + f * (this.z[hi] - this.z[lo]);
  }

  /**
   * Altitude (m) lost while steering for thrust_s seconds from the entry end, for a vehicle whose
   * descent speed is f times nominal (its clock runs f times faster through the table).
   */
  steeredDrop(thrust_s: number, f = 1): number {
    return this.entryEnd_m - this.altitudeAt(this.entryTime_s + f * thrust_s);
  }
}
