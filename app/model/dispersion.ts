import type { Vec } from './flight';

/** Scale of the P-probability ellipse of a 2-D normal, k = √(−2 ln(1−P)) (Hoover 1984). */
export function ellipseScale(p: number): number {
  return Math.sqrt(-2 * Math.log(1 - p));
}

/** A landing ellipse in the local frame: semi-axes in m, major-axis azimuth in degrees true. */
export interface LocalEllipse {
  center: Vec;
  semiMajor_m: number;
  semiMinor_m: number;
  /** Azimuth of the major axis, degrees true in [0, 180). */
  azimuth_deg: number;
}

/** Summary of a batch of landing points about a site. */
export interface Dispersion {
  mean: Vec;
  /** Sample covariance [xx, xy, yy], m². */
  cov: [number, number, number];
  ellipse50: LocalEllipse;
  ellipse95: LocalEllipse;
  ellipse99: LocalEllipse;
  /** Median miss distance from the site, m. */
  cep_m: number;
  /** Share of landings within the tolerance of the site. */
  pHit: number;
}

/** Ellipse holding probability p of a normal with the given mean and covariance [xx, xy, yy]. */
export function covarianceEllipse(mean: Vec, cov: readonly number[], p: number): LocalEllipse {
  const [sxx, sxy, syy] = cov;
  const half = (sxx + syy) / 2;
  const r = Math.hypot((sxx - syy) / 2, sxy);
  const l1 = Math.max(0, half + r);
  const l2 = Math.max(0, half - r);
  const k = ellipseScale(p);
  // Angle of the major axis from east, counter-clockwise; azimuth is clockwise from north.
  const theta = 0.5 * Math.atan2(2 * sxy, sxx - syy);
  let az = 90 - (theta * 180) / Math.PI;
  az = ((az % 180) + 180) % 180;
  return {
    center: { ...mean },
    semiMajor_m: k * Math.sqrt(l1),
    semiMinor_m: k * Math.sqrt(l2),
    azimuth_deg: az,
  };
}

/** Median of values (reorders the array): Hoare's quickselect, O(n) on average. */
export function median(a: Float64Array): number {
  const n = a.length;
  const kth = (k: number): number => {
    let lo = 0;
    let hi = n - 1;
    while (lo < hi) {
      const pivot = a[(lo + hi) >> 1];
      let i = lo;
      let j = hi;
      while (i <= j) {
        while (a[i] < pivot) i++;
        while (a[j] > pivot) j--;
        if (i <= j) {
          const t = a[i];
          a[i] = a[j];
          a[j] = t;
          i++;
          j--;
        }
      }
      if (k <= j) hi = j;
      else if (k >= i) lo = i;
      else return a[k];
    }
    return a[k];
  };
  if (n % 2 === 1) return kth((n - 1) / 2);
  const upper = kth(n / 2);
  // After selecting n/2, everything before it is ≤ it: the lower middle is their maximum.
  let lower = -Infinity;
  for (let i = 0; i < n / 2; i++) if (a[i] > lower) lower = a[i];
  return (lower + upper) / 2;
}

/**
 * Statistics of n landing points (xs, ys) shifted by `shift`, about `site` with hit radius
 * tol_m: mean, covariance, 50/95/99 % ellipses, CEP (median miss) and P(hit). A NaN landing
 * (a descent that met no known ground) is a miss at infinite distance: it counts in P(hit) and
 * the CEP, and is left out of the mean and covariance (which are the site's and zero when no
 * landing is known).
 */
export function summarize(
  xs: Float64Array,
  ys: Float64Array,
  site: Vec,
  tol_m: number,
  shift: Vec = { x: 0, y: 0 },
): Dispersion {
  const n = xs.length;
  let mx = 0;
  let my = 0;
  let known = 0;
  for (let i = 0; i < n; i++) {
    const x = xs[i];
    const y = ys[i];
    if (x !== x || y !== y) continue; // NaN: met no known ground
    mx += x;
    my += y;
    known++;
  }
  mx = known > 0 ? mx / known + shift.x : site.x;
  my = known > 0 ? my / known + shift.y : site.y;
  let sxx = 0;
  let sxy = 0;
  let syy = 0;
  const miss = new Float64Array(n);
  let hits = 0;
  const tol2 = tol_m * tol_m;
  for (let i = 0; i < n; i++) {
    const x = xs[i] + shift.x;
    const y = ys[i] + shift.y;
    if (x !== x || y !== y) {
      miss[i] = Infinity;
      continue;
    }
    const dx = x - mx;
    const dy = y - my;
    sxx += dx * dx;
    sxy += dx * dy;
    syy += dy * dy;
    const ex = x - site.x;
    const ey = y - site.y;
    const d2 = ex * ex + ey * ey;
    if (d2 <= tol2) hits++;
    miss[i] = Math.sqrt(d2);
  }
  const dof = known > 1 ? known - 1 : 1;
  const cov: [number, number, number] = [sxx / dof, sxy / dof, syy / dof];
  const cep = median(miss);
  const mean = { x: mx, y: my };
  return {
    mean,
    cov,
    ellipse50: covarianceEllipse(mean, cov, 0.5),
    ellipse95: covarianceEllipse(mean, cov, 0.95),
    ellipse99: covarianceEllipse(mean, cov, 0.99),
    cep_m: cep,
    pHit: hits / n,
  };
}
