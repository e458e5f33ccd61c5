import { describe, expect, it } from 'vitest';
import { FallTable } from '../../app/model/fall-table';
import { flySamples, passiveOffset, type FlightSetup } from '../../app/model/flight';
import { Rng } from '../../app/model/rng';
import { WindProfile } from '../../app/model/wind';
import type { Uncertainty } from '../../app/model/types';

const wind = new WindProfile(
  [
    { altitude_m: 10, fromDeg: 250, speed_mps: 3 },
    { altitude_m: 150, fromDeg: 280, speed_mps: 8 },
  ],
  { groundElevation_m: 0 },
);
const table = new FallTable({
  top_m: 200,
  bottom_m: 0,
  descentRateSL_mps: 3,
  entryLoss_m: 5,
  isaOffset_K: 0,
  wind,
});
const w0 = wind.at(200);
const base: FlightSetup = {
  table,
  guidance: 'passive',
  cotGamma: 0,
  controlTime_s: 0,
  carrier: { x: 8, y: 0 },
  windTop: { x: w0.east_mps, y: w0.north_mps },
};
const unc: Uncertainty = {
  windSpeed_mps: 1.2,
  windCorrelation_m: 150,
  descentRate_pct: 0,
  releasePosition_m: 0,
  heading_deg: 0,
  releaseTiming_s: 0,
};

function stats(setup: FlightSetup, n: number, seed: number) {
  const xs = new Float64Array(n);
  const ys = new Float64Array(n);
  flySamples(
    setup,
    {
      n,
      rng: new Rng(seed),
      uncertainty: unc,
      release: { x: 0, y: 0 },
      trackUnit: { x: 1, y: 0 },
      groundSpeed_mps: 8,
      site: { x: 0, y: 0 },
    },
    xs,
    ys,
  );
  let mx = 0;
  let my = 0;
  for (let i = 0; i < n; i++) {
    mx += xs[i];
    my += ys[i];
  }
  mx /= n;
  my /= n;
  let vx = 0;
  let vy = 0;
  let cxy = 0;
  for (let i = 0; i < n; i++) {
    vx += (xs[i] - mx) ** 2;
    vy += (ys[i] - my) ** 2;
    cxy += (xs[i] - mx) * (ys[i] - my);
  }
  return { mx, my, vx: vx / (n - 1), vy: vy / (n - 1), cxy: cxy / (n - 1) };
}

describe('the aggregated wind-error draw of open-loop flights', () => {
  // docs/model.md §8: passive flights draw A = Σ ε_k Δt_k as one exact Gaussian; homing steps the
  // same AR(1) error band by band. A "homing" flight that cannot steer (cot γ = 0) must then land
  // with the same distribution as the passive one (theorem: a linear functional of a Gaussian
  // process is Gaussian with variance aᵀCa).
  const n = 40000;
  const p = stats(base, n, 11);
  const h = stats({ ...base, guidance: 'homing' }, n, 12);

  it('has the same mean landing, within 5 standard errors of the mean (σ/√n)', () => {
    expect(Math.abs(p.mx - h.mx)).toBeLessThan(5 * Math.sqrt((p.vx + h.vx) / n));
    expect(Math.abs(p.my - h.my)).toBeLessThan(5 * Math.sqrt((p.vy + h.vy) / n));
  });

  it('has the same variances, within 5 standard errors of a normal variance (σ²·√(2/n))', () => {
    expect(Math.abs(p.vx - h.vx)).toBeLessThan(
      5 * Math.sqrt(2 / n) * Math.max(p.vx, h.vx) * Math.SQRT2,
    );
    expect(Math.abs(p.vy - h.vy)).toBeLessThan(
      5 * Math.sqrt(2 / n) * Math.max(p.vy, h.vy) * Math.SQRT2,
    );
    // And the spread is real: tens of metres for 1.2 m/s over a ~65 s fall.
    expect(Math.sqrt(p.vx)).toBeGreaterThan(20);
  });

  it('centres on the nominal uncontrolled landing (zero-mean errors)', () => {
    const o = passiveOffset(base);
    expect(Math.abs(p.mx - o.x)).toBeLessThan(5 * Math.sqrt(p.vx / n));
    expect(Math.abs(p.my - o.y)).toBeLessThan(5 * Math.sqrt(p.vy / n));
  });
});
