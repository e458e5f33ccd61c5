import type { Vec } from './flight';

/**
 * P(hit) as a step function of a release shift s along a unit direction: p[j] holds on
 * [s[j], s[j+1]); outside [s[0], s[last]] it is 0. Times are in seconds when speed_mps is the
 * carrier's ground speed, metres when it is 1.
 */
export interface HitProfile {
  s: Float64Array;
  p: Float64Array;
}

/**
 * Exact P(hit) against a release shift for flights whose landing moves with the release point
 * (passive and fixed-heading): sample i hits while |L_i + s·v·u − site| ≤ tol, a chord of the
 * tolerance circle; sweeping the chord ends gives the step function (docs/model.md §9).
 */
export function hitProfile(
  xs: Float64Array,
  ys: Float64Array,
  site: Vec,
  tol_m: number,
  unit: Vec,
  speed_mps: number,
): HitProfile {
  const n = xs.length;
  const ev: number[] = [];
  for (let i = 0; i < n; i++) {
    const qx = xs[i] - site.x;
    const qy = ys[i] - site.y;
    const along = qx * unit.x + qy * unit.y;
    const across = qx * unit.y - qy * unit.x;
    // `!(… <= …)` also drops a NaN landing; a non-finite chord end is dropped too, so the sweep
    // below always advances and ends after at most 2n steps.
    if (!(Math.abs(across) <= tol_m)) continue;
    const h = Math.sqrt(tol_m * tol_m - across * across);
    const open = (-along - h) / speed_mps;
    const close = (-along + h) / speed_mps;
    if (Number.isFinite(open) && Number.isFinite(close)) ev.push(open, close);
  }
  const m = ev.length / 2;
  const starts = new Float64Array(m);
  const ends = new Float64Array(m);
  for (let i = 0; i < m; i++) {
    starts[i] = ev[2 * i];
    ends[i] = ev[2 * i + 1];
  }
  starts.sort();
  ends.sort();
  const s: number[] = [];
  const p: number[] = [];
  let a = 0;
  let b = 0;
  let count = 0;
  while (a < m || b < m) {
    // Closed chords: at a tie the sample enters before the other leaves.
    const x = a < m && starts[a] <= ends[b] ? starts[a] : ends[b];
    while (a < m && starts[a] === x) {
      count++;
      a++;
    }
    while (b < m && ends[b] === x && (a >= m || starts[a] > x)) {
      count--;
      b++;
    }
    s.push(x);
    p.push(count / n);
  }
  return { s: Float64Array.from(s), p: Float64Array.from(p) };
}

/** P(hit) of a profile at shift x. */
export function profileAt(pr: HitProfile, x: number): number {
  const s = pr.s;
  if (s.length === 0 || x < s[0] || x > s[s.length - 1]) return 0;
  let lo = 0;
  let hi = s.length - 1;
  while (hi - lo > 1) {
    const mid = (lo + hi) >> 1;
    if (s[mid] <= x) lo = mid;
    else hi = mid;
  }
  return x === s[hi] ? Math.max(pr.p[lo], pr.p[hi]) : pr.p[lo];
}

/** The stretch of shifts around x0 where P(hit) ≥ required, or null if P(x0) is below it. */
export function runAround(pr: HitProfile, x0: number, required: number): [number, number] | null {
  if (pr.s.length === 0 || profileAt(pr, x0) < required) return null;
  const s = pr.s;
  let j = 0;
  while (j + 1 < s.length && s[j + 1] <= x0) j++;
  let lo = j;
  while (lo > 0 && pr.p[lo - 1] >= required) lo--;
  let hi = j;
  while (hi + 1 < s.length && pr.p[hi] >= required) hi++;
  return [s[lo], s[hi]];
}

/** Shift with the highest P(hit): the middle of the widest stretch at the maximum. */
export function bestShift(pr: HitProfile): { shift: number; pHit: number } {
  let pMax = 0;
  for (const v of pr.p) pMax = Math.max(pMax, v);
  if (pMax === 0) return { shift: NaN, pHit: 0 };
  let best = 0;
  let bestWidth = -1;
  for (let j = 0; j < pr.s.length - 1; j++) {
    if (pr.p[j] !== pMax) continue;
    let k = j;
    while (k + 1 < pr.s.length - 1 && pr.p[k + 1] === pMax) k++;
    const width = pr.s[k + 1] - pr.s[j];
    if (width > bestWidth) {
      bestWidth = width;
      best = (pr.s[j] + pr.s[k + 1]) / 2;
    }
    j = k;
  }
  return { shift: best, pHit: pMax };
}

/**
 * Edge of the stretch where evalP ≥ required, by bisection between an inside shift (P ≥ required)
 * and an outside one; `steps` halvings.
 */
export function bisectEdge(
  evalP: (s: number) => number,
  inside: number,
  outside: number,
  required: number,
  steps: number,
): number {
  let a = inside;
  let b = outside;
  for (let i = 0; i < steps; i++) {
    const m = (a + b) / 2;
    if (evalP(m) >= required) a = m;
    else b = m;
  }
  return (a + b) / 2;
}

/** An edge found by `searchEdge`; `bounded` is false when the search limit was reached first. */
export interface SearchedEdge {
  edge: number;
  bounded: boolean;
}

/**
 * Edge of the stretch where evalP ≥ required, walking out from 0 along the sign of `start`: the
 * outside point is `start` doubled at most `doublings` times, then `steps` halvings
 * (docs/model.md §9). Costs at most doublings + steps + 1 evaluations whatever the inputs. When
 * P(hit) still meets the requirement at the farthest point tried, `bounded` is false and `edge`
 * is (close to) that point: the true edge lies farther out.
 */
export function searchEdge(
  evalP: (s: number) => number,
  start: number,
  required: number,
  doublings: number,
  steps: number,
): SearchedEdge {
  let out = start;
  let i = 0;
  for (; i < doublings && evalP(out) >= required; i++) out *= 2;
  const bounded = i < doublings || evalP(out) < required;
  return { edge: bisectEdge(evalP, 0, out, required, steps), bounded };
}
