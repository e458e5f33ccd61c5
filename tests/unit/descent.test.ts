import fc from 'fast-check';
import { describe, expect, it } from 'vitest';
import { airAt } from '../../app/model/atmosphere';
import { FallTable } from '../../app/model/fall-table';
import {
  fixedHeadingProgramme,
  forwardThrow,
  passiveOffset,
  reachRadius,
  type FlightSetup,
  type Vec,
} from '../../app/model/flight';
import { naiveFlight } from '../../app/model/naive-integrator';
import type { Guidance, WindLayer } from '../../app/model/types';
import { planDrop } from '../../app/planner/planner';
import { WindProfile } from '../../app/model/wind';
import { expectClose, makePlan } from './helpers';

// Sea-level standard density, USSA 1976 (docs/references.md, SEEN): the reference of descentRate_mps.
const RHO0 = 1.225;
// Standard gravity, USSA 1976 (docs/references.md, SEEN).
const G0 = 9.80665;
const DEG = Math.PI / 180;

interface Case {
  top_m: number;
  bottom_m: number;
  wSL: number;
  entryLoss_m?: number;
  isa_K?: number;
  layers?: WindLayer[];
  ground_m?: number;
  carrier?: Vec;
  guidance?: Guidance;
  cotGamma?: number;
  controlTime_s?: number;
  throwTime_s?: number;
}

function build(c: Case): { s: FlightSetup; wind: WindProfile; table: FallTable } {
  const wind = new WindProfile(c.layers ?? [], {
    reference: 'AGL',
    groundElevation_m: c.ground_m ?? c.bottom_m,
  });
  const table = new FallTable({
    top_m: c.top_m,
    bottom_m: c.bottom_m,
    descentRateSL_mps: c.wSL,
    entryLoss_m: c.entryLoss_m ?? 0,
    isaOffset_K: c.isa_K ?? 0,
    wind,
  });
  const wt = wind.at(c.top_m);
  const s: FlightSetup = {
    table,
    guidance: c.guidance ?? 'passive',
    cotGamma: c.cotGamma ?? 0,
    controlTime_s: c.controlTime_s ?? 0,
    throwTime_s: c.throwTime_s,
    carrier: c.carrier ?? { x: 0, y: 0 },
    windTop: { x: wt.east_mps, y: wt.north_mps },
  };
  return { s, wind, table };
}

/** Descent speed (m/s) at geometric altitude z, momentum theory: w = w_SL·√(ρ0/ρ(z)). */
const rateAt = (wSL: number, z: number, isa = 0): number =>
  wSL * Math.sqrt(RHO0 / airAt(z, isa).density_kgm3);

/** Composite Simpson's rule of f over [a, b] with n (even) intervals. */
function simpson(f: (x: number) => number, a: number, b: number, n: number): number {
  const h = (b - a) / n;
  let sum = f(a) + f(b);
  for (let i = 1; i < n; i++) sum += (i % 2 === 1 ? 4 : 2) * f(a + i * h);
  return (sum * h) / 3;
}

/** Altitude lost in t_s seconds from z0 by dz/dt = −w(z), classical RK4 with step h_s. */
function altitudeLost(wSL: number, z0: number, zGround: number, t_s: number, isa = 0): number {
  const f = (z: number): number => -rateAt(wSL, z, isa);
  const n = Math.max(1, Math.ceil(t_s / 0.05));
  const h = t_s / n;
  let z = z0;
  for (let i = 0; i < n && z > zGround; i++) {
    const k1 = f(z);
    const k2 = f(z + (h / 2) * k1);
    const k3 = f(z + (h / 2) * k2);
    const k4 = f(z + h * k3);
    z += (h / 6) * (k1 + 2 * k2 + 2 * k3 + k4);
  }
  return z0 - Math.max(z, zGround);
}

describe('drift in a uniform wind', () => {
  // Field-manual practice (docs/references.md "Unguided release-point practice"): drift = wind × fall time.
  it('drift equals wind times fall time in a uniform wind', () => {
    // One layer at 0 m AGL: the profile is uniform above the ground (wind.ts, constant above top).
    const layers = [{ altitude_m: 0, fromDeg: 250, speed_mps: 6 }];
    const { table } = build({ top_m: 400, bottom_m: 100, wSL: 3, layers, isa_K: 8 });
    const we = -6 * Math.sin(250 * DEG);
    const wn = -6 * Math.cos(250 * DEG);
    expectClose(table.drift.east_m, we * table.fallTime_s, 1e-9, 'east');
    expectClose(table.drift.north_m, wn * table.fallTime_s, 1e-9, 'north');
  });

  it('a carrier drifting with the air gives no throw, so the landing offset is the drift alone', () => {
    const layers = [{ altitude_m: 0, fromDeg: 300, speed_mps: 5 }];
    const probe = build({ top_m: 150, bottom_m: 0, wSL: 2.5, layers });
    const carrier = probe.s.windTop; // air-relative speed zero
    const { s, table } = build({ top_m: 150, bottom_m: 0, wSL: 2.5, layers, carrier });
    const off = passiveOffset(s);
    expectClose(off.x, carrier.x * table.fallTime_s, 1e-9, 'east');
    expectClose(off.y, carrier.y * table.fallTime_s, 1e-9, 'north');
  });

  // Linear-drag relaxation (docs/references.md, from memory): a body released from a hovering carrier
  // starts at rest over the ground and lags the air by wind·τ, τ = w/g.
  it('a hovering carrier in a uniform wind lands wind × (fall time − w/g) downwind', () => {
    const layers = [{ altitude_m: 0, fromDeg: 270, speed_mps: 5 }];
    const { s, table } = build({ top_m: 150, bottom_m: 0, wSL: 2.5, layers });
    const tau = rateAt(2.5, 150) / G0;
    expectClose(passiveOffset(s).x, 5 * (table.fallTime_s - tau), 1e-9, 'east');
    expectClose(passiveOffset(s).y, 0, 1e-9, 'north');
  });
});

describe('fall time with the density correction', () => {
  // Momentum theory of vertical autorotation: w ∝ ρ^−½ (Leishman, Principles of Helicopter
  // Aerodynamics, 2nd ed., ch. 12, via docs/references.md). Fall time = ∫ dz / w(z), integrated here
  // independently by composite Simpson's rule (2000 intervals: error ≪ 1 µs for this smooth integrand).
  for (const c of [
    { top: 120, bottom: 0, wSL: 3, isa: 0 },
    { top: 600, bottom: 0, wSL: 1.2, isa: 0 },
    { top: 2300, bottom: 1500, wSL: 4, isa: 15 },
    { top: 900, bottom: 350, wSL: 2.2, isa: -20 },
  ]) {
    it(`fall time equals ∫ dz / (w_SL √(ρ0/ρ(z))) from ${c.top} m to ${c.bottom} m, ISA${c.isa >= 0 ? '+' : ''}${c.isa}`, () => {
      const { table } = build({ top_m: c.top, bottom_m: c.bottom, wSL: c.wSL, isa_K: c.isa });
      const expected = simpson((z) => 1 / rateAt(c.wSL, z, c.isa), c.bottom, c.top, 2000);
      expectClose(table.fallTime_s, expected, 1e-6, 'fall time');
    });
  }

  // Closed-form bounds: density falls with height, so w(ground) ≤ w ≤ w(top) all the way down.
  it('fall time lies between H/w(top) and H/w_SL for a fall to sea level in ISA', () => {
    for (const top of [50, 300, 1000, 3000]) {
      const { table } = build({ top_m: top, bottom_m: 0, wSL: 3 });
      expect(table.fallTime_s).toBeLessThanOrEqual(top / 3);
      expect(table.fallTime_s).toBeGreaterThanOrEqual(top / rateAt(3, top));
    }
  });

  it('at sea level in the standard atmosphere the descent rate equals w_SL', () => {
    const { table } = build({ top_m: 0, bottom_m: -20, wSL: 3.1 });
    expectClose(table.wTop_mps, 3.1, 1e-7, 'w at 0 m');
  });

  // USSA 1976 density at 1000 m geopotential 1.11164 kg/m³ (docs/references.md); 1000 m geopotential
  // is 1000.157 m geometric (USSA 1976 eq. 18). w/w_SL = √(1.225/1.11164) = 1.04975; tolerance
  // from the table's last digit: ½·5e-6/1.11164 = 2.2e-6 relative.
  it('w(z)/w_SL = √(ρ0/ρ(z)) at 1000 m geopotential with the USSA 1976 density 1.11164 kg/m³', () => {
    const z = (6356766 * 1000) / (6356766 - 1000);
    const { table } = build({ top_m: z, bottom_m: 0, wSL: 2 });
    const ratio = Math.sqrt(1.225 / 1.11164);
    expectClose(table.wTop_mps / 2, ratio, 2.5e-6 * ratio, 'w/w_SL');
    expectClose(ratio, 1.04975, 0.00001, 'hand value');
  });

  // Momentum theory (docs/references.md): V = √(2W/(ρAC)), so descent speed scales as √(m/m_ref) and
  // every time of fall as √(m_ref/m).
  it('scales the descent rate by √(m/m_ref) for a heavier payload', () => {
    const light = planDrop(
      makePlan({ variants: [{ id: 'p', guidance: 'passive', descentRate_mps: 3 }] }),
    );
    const heavy = planDrop(
      makePlan({
        variants: [
          {
            id: 'p',
            guidance: 'passive',
            descentRate_mps: 3,
            referenceMass_kg: 0.045,
            payloadMass_kg: 0.06,
          },
        ],
      }),
    );
    expectClose(
      heavy.sites[0].fallTime_s / light.sites[0].fallTime_s,
      Math.sqrt(0.045 / 0.06),
      1e-9,
      'time ratio',
    );
  });
});

describe('fall tables against the independent time-stepping integrator', () => {
  const layer = fc.record({
    altitude_m: fc.integer({ min: 0, max: 700 }),
    fromDeg: fc.double({ min: 0, max: 359, noNaN: true }),
    speed_mps: fc.double({ min: 0, max: 15, noNaN: true }),
  });
  // naiveFlight: plain 10 ms midpoint stepping with the atmosphere and wind evaluated every
  // step, sharing no tables with FallTable.
  it('FallTable fall time and drift agree with naiveFlight within 0.1 m and 0.05 s', () => {
    fc.assert(
      fc.property(
        fc.uniqueArray(layer, { minLength: 1, maxLength: 4, selector: (l) => l.altitude_m }),
        fc.integer({ min: 20, max: 400 }),
        fc.integer({ min: 0, max: 2000 }),
        fc.double({ min: -25, max: 25, noNaN: true }),
        fc.double({ min: 1, max: 5, noNaN: true }),
        fc.double({ min: 0, max: 15, noNaN: true }),
        (layers, height, ground, isa, wSL, speed) => {
          const carrier = { x: speed * 0.6, y: -speed * 0.8 };
          const c = { top_m: ground + height, bottom_m: ground, wSL, isa_K: isa, layers, carrier };
          const { s, wind, table } = build(c);
          const ref = naiveFlight({
            top_m: c.top_m,
            bottom_m: c.bottom_m,
            descentRateSL_mps: wSL,
            entryLoss_m: 0,
            isaOffset_K: isa,
            wind,
            carrier,
          });
          const off = passiveOffset(s);
          expectClose(table.fallTime_s, ref.time_s, 0.05, 'fall time');
          expect(Math.hypot(off.x - ref.x, off.y - ref.y)).toBeLessThanOrEqual(0.1);
        },
      ),
      { numRuns: 25, seed: 20261201 },
    );
  });

  it('agrees with naiveFlight in the demo-like sheared profile over raised ground', () => {
    const layers = [
      { altitude_m: 10, fromDeg: 274, speed_mps: 3.2 },
      { altitude_m: 50, fromDeg: 281, speed_mps: 4.5 },
      { altitude_m: 100, fromDeg: 289, speed_mps: 5.4 },
      { altitude_m: 200, fromDeg: 299, speed_mps: 6.5 },
    ];
    const { s, wind, table } = build({
      top_m: 199,
      bottom_m: 89.4,
      ground_m: 89,
      wSL: 3.1,
      isa_K: -12,
      layers,
      carrier: { x: -12.2, y: -4.4 },
    });
    const ref = naiveFlight({
      top_m: 199,
      bottom_m: 89.4,
      descentRateSL_mps: 3.1,
      entryLoss_m: 0,
      isaOffset_K: -12,
      wind,
      carrier: { x: -12.2, y: -4.4 },
    });
    const off = passiveOffset(s);
    expectClose(table.fallTime_s, ref.time_s, 0.05, 'fall time');
    expectClose(off.x, ref.x, 0.1, 'east');
    expectClose(off.y, ref.y, 0.1, 'north');
  });
});

describe('reach of a steered vehicle', () => {
  // Glide geometry (common practice): a vehicle gliding at angle γ below the horizontal covers
  // cot γ metres across the air per metre of height lost.
  const base = {
    top_m: 700,
    bottom_m: 500,
    wSL: 2.8,
    entryLoss_m: 12,
    isa_K: 5,
    guidance: 'fixed-heading' as const,
  };

  for (const [gamma, control] of [
    [45, 20],
    [30, 8],
    [60, 35],
  ]) {
    it(`reach = cot γ × altitude lost in the control time after the entry (γ ${gamma}°, ${control} s)`, () => {
      const cot = 1 / Math.tan(gamma * DEG);
      const { s } = build({ ...base, cotGamma: cot, controlTime_s: control });
      const lost = altitudeLost(base.wSL, base.top_m - base.entryLoss_m, base.bottom_m, control, 5);
      expectClose(reachRadius(s), cot * lost, 0.01, 'reach');
    });
  }

  it('reach = cot γ × (entry end − ground) when the control time outlasts the fall', () => {
    const cot = 1 / Math.tan(40 * DEG);
    const { s } = build({ ...base, cotGamma: cot, controlTime_s: 500 });
    expectClose(reachRadius(s), cot * (700 - 12 - 500), 1e-6, 'reach');
  });

  it('a passive vehicle has no reach', () => {
    const { s } = build({ ...base, guidance: 'passive', cotGamma: 1, controlTime_s: 20 });
    expect(reachRadius(s)).toBe(0);
  });
});

describe('forward throw', () => {
  // Linear-drag relaxation time τ = w/g (docs/references.md, from memory / common practice): the
  // released body keeps the carrier's air-relative velocity for τ.
  it('forward throw = (carrier ground velocity − wind at release) · w/g', () => {
    const layers = [
      { altitude_m: 0, fromDeg: 90, speed_mps: 2 },
      { altitude_m: 300, fromDeg: 180, speed_mps: 7 },
    ];
    const carrier = { x: 9, y: -5 };
    const { s } = build({ top_m: 300, bottom_m: 0, wSL: 3, layers, carrier });
    // Wind at 300 m AGL: from 180° at 7 m/s, i.e. 7 m/s toward the north.
    const tau = rateAt(3, 300) / G0;
    const th = forwardThrow(s);
    expectClose(th.x, 9 * tau, 1e-9, 'east');
    expectClose(th.y, (-5 - 7) * tau, 1e-9, 'north');
  });

  it('is 13 m/s × 3.1/9.80665 s = 4.109 m for a 13 m/s carrier at sea level in calm air', () => {
    const { s } = build({ top_m: 0, bottom_m: -30, wSL: 3.1, carrier: { x: 13, y: 0 } });
    expectClose(forwardThrow(s).x, 4.109, 0.001, 'throw');
  });

  it('uses a set throw time instead of w/g when the variant gives one', () => {
    const { s } = build({
      top_m: 100,
      bottom_m: 0,
      wSL: 3,
      carrier: { x: 0, y: 10 },
      throwTime_s: 0.5,
    });
    expectClose(forwardThrow(s).y, 5, 1e-12, 'throw');
  });
});

describe('fixed-heading programme', () => {
  const layers = [
    { altitude_m: 5, fromDeg: 200, speed_mps: 2 },
    { altitude_m: 80, fromDeg: 240, speed_mps: 5 },
    { altitude_m: 160, fromDeg: 260, speed_mps: 7 },
  ];
  const c = {
    top_m: 330,
    bottom_m: 180,
    ground_m: 180,
    wSL: 2.8,
    entryLoss_m: 8,
    isa_K: -5,
    layers,
    carrier: { x: -6, y: 3 },
    guidance: 'fixed-heading' as const,
    cotGamma: 1 / Math.tan(45 * DEG),
    controlTime_s: 22,
  };
  const fly = (s: FlightSetup, wind: WindProfile, heading: number, thrust: number) =>
    naiveFlight({
      top_m: c.top_m,
      bottom_m: c.bottom_m,
      descentRateSL_mps: c.wSL,
      entryLoss_m: c.entryLoss_m,
      isaOffset_K: c.isa_K,
      wind,
      carrier: c.carrier,
      cotGamma: s.cotGamma,
      headingTrue_deg: heading,
      thrust_s: thrust,
    });

  it('the fixed-heading programme lands on the site in the forecast wind (naiveFlight within 0.1 m)', () => {
    const { s, wind } = build(c);
    const off = passiveOffset(s);
    const reach = reachRadius(s);
    expect(reach).toBeGreaterThan(20);
    for (const [frac, az] of [
      [0.1, 0],
      [0.5, 75],
      [0.8, 190],
      [0.95, 300],
    ]) {
      const need = { x: frac * reach * Math.sin(az * DEG), y: frac * reach * Math.cos(az * DEG) };
      const target = { x: off.x + need.x, y: off.y + need.y };
      const prog = fixedHeadingProgramme(s, need);
      expect(prog.thrust_s).toBeLessThan(c.controlTime_s);
      const land = fly(s, wind, prog.headingTrue_deg, prog.thrust_s);
      expect(Math.hypot(land.x - target.x, land.y - target.y)).toBeLessThanOrEqual(0.1);
    }
  });

  it('outside the reach it thrusts the full control time toward the target', () => {
    const { s, wind } = build(c);
    const reach = reachRadius(s);
    const need = { x: -2 * reach, y: 2 * reach }; // bearing 315°
    const prog = fixedHeadingProgramme(s, need);
    expectClose(prog.thrust_s, c.controlTime_s, 1e-9, 'thrust');
    expectClose(prog.headingTrue_deg, 315, 1e-9, 'heading');
    // It then lands at the reach circle's edge on the line to the target.
    const off = passiveOffset(s);
    const land = fly(s, wind, prog.headingTrue_deg, prog.thrust_s);
    const edge = { x: off.x - reach * Math.SQRT1_2, y: off.y + reach * Math.SQRT1_2 };
    expect(Math.hypot(land.x - edge.x, land.y - edge.y)).toBeLessThanOrEqual(0.1);
  });

  it('asks for no thrust when the site is the uncontrolled landing', () => {
    const { s } = build(c);
    expect(fixedHeadingProgramme(s, { x: 0, y: 0 }).thrust_s).toBe(0);
  });
});
