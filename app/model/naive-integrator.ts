import { densityAt } from './atmosphere';
import { G0, RHO0 } from './constants';
import type { Vec } from './flight';
import type { WindProfile } from './wind';

/** Inputs of one deterministic flight for the reference integrator. */
export interface NaiveFlight {
  top_m: number;
  bottom_m: number;
  descentRateSL_mps: number;
  entryLoss_m: number;
  isaOffset_K: number;
  wind: WindProfile;
  carrier: Vec;
  /** cot γ and an open-loop programme (heading true, thrust s); omit for passive. */
  cotGamma?: number;
  headingTrue_deg?: number;
  thrust_s?: number;
  /** Time step, s (default 0.01). */
  dt_s?: number;
}

/**
 * Reference flight by plain time stepping (midpoint rule, fixed step, default 10 ms), evaluating
 * the atmosphere and the wind at every step. It shares no tables with the planner and serves as
 * the independent check of the fall tables and as the baseline of the benchmark.
 * Returns the landing point relative to the release point (m) and the fall time (s).
 */
export function naiveFlight(f: NaiveFlight): { x: number; y: number; time_s: number } {
  const dt = f.dt_s ?? 0.01;
  const rate = (z: number): number =>
    f.descentRateSL_mps * Math.sqrt(RHO0 / densityAt(z, f.isaOffset_K));
  const w0 = f.wind.at(f.top_m);
  const tau = rate(f.top_m) / G0;
  let x = (f.carrier.x - w0.east_mps) * tau;
  let y = (f.carrier.y - w0.north_mps) * tau;
  let z = f.top_m;
  let t = 0;
  const entryEnd = f.top_m - f.entryLoss_m;
  let thrustStart = Infinity;
  const h = ((f.headingTrue_deg ?? 0) * Math.PI) / 180;
  const cot = f.cotGamma ?? 0;
  const thrust = f.thrust_s ?? 0;
  const wind = { east_mps: 0, north_mps: 0 };
  // Horizontal and vertical velocity at altitude zz and time tt.
  const vel = (zz: number, tt: number): [number, number, number] => {
    const w = rate(zz);
    f.wind.sample(zz, wind);
    let vx = wind.east_mps;
    let vy = wind.north_mps;
    if (tt >= thrustStart && tt < thrustStart + thrust) {
      vx += cot * w * Math.sin(h);
      vy += cot * w * Math.cos(h);
    }
    return [vx, vy, w];
  };
  for (;;) {
    if (thrustStart === Infinity && z <= entryEnd) thrustStart = t;
    const zm = z - (rate(z) * dt) / 2;
    const [vx, vy, w] = vel(zm, t + dt / 2);
    if (z - w * dt <= f.bottom_m) {
      const frac = (z - f.bottom_m) / w / dt;
      return { x: x + vx * dt * frac, y: y + vy * dt * frac, time_s: t + dt * frac };
    }
    x += vx * dt;
    y += vy * dt;
    z -= w * dt;
    t += dt;
  }
}
