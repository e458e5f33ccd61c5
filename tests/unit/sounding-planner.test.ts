import { describe, expect, it } from 'vitest';
import { airAt } from '../../app/model/atmosphere';
import { planDrop } from '../../app/planner/planner';
import { makePlan, RELEASE } from './helpers';

describe('planning with a sounding instead of the ISA offset', () => {
  const base = {
    release: { ...RELEASE, altitude_m: 150, reference: 'AGL' as const },
    variants: [{ id: 'p', guidance: 'passive' as const, descentRate_mps: 3 }],
    sites: [{ id: 's', ...RELEASE }],
    monteCarlo: { samples: 10, seed: 1 },
  };

  it('an ISA sounding gives the same fall time as the ISA (USSA 1976)', () => {
    const isa = planDrop(makePlan(base)).sites[0];
    const levels = [0, 500, 1000].map((z) => ({
      altitude_m: z,
      temperature_K: airAt(z).temperature_K,
    }));
    const snd = planDrop(makePlan({ ...base, atmosphere: { sounding: { levels } } })).sites[0];
    // Hydrostatic density of the ISA temperatures equals the ISA density to < 0.1 %, so the fall
    // time (∝ √ρ) agrees to < 0.05 %.
    expect(Math.abs(snd.fallTime_s - isa.fallTime_s) / isa.fallTime_s).toBeLessThan(5e-4);
  });

  it('a warmer sounding (thinner air) makes the fall quicker, as √(ρ) predicts', () => {
    const isa = planDrop(makePlan(base)).sites[0];
    const warm = [0, 1000].map((z) => ({
      altitude_m: z,
      temperature_K: airAt(z).temperature_K + 30,
    }));
    const snd = planDrop(makePlan({ ...base, atmosphere: { sounding: { levels: warm } } }))
      .sites[0];
    // Same pressure near the ground, T +30 K: ρ falls by ≈ 288/318, fall time by ≈ √(288/318) ≈ 0.952.
    const ratio = snd.fallTime_s / isa.fallTime_s;
    expect(ratio).toBeGreaterThan(0.94);
    expect(ratio).toBeLessThan(0.96);
  });
});
