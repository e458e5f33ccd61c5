// The plan's air: the wind profile and the density column its fields describe (docs/model.md §2, §11).
import type { Plan } from './plan';
import { SoundingAtmosphere, WindProfile, type WindProfileOptions } from '../model';

/** Options that read a plan's wind layers: its reference, ground elevation and surface exponent. */
export function planWindOptions(plan: Plan): WindProfileOptions {
  return {
    reference: plan.winds.reference,
    groundElevation_m: plan.groundElevation_m,
    surfaceExponent: plan.winds.surfaceExponent,
  };
}

/** The wind profile a plan's layers describe (docs/model.md §2). */
export function planWindProfile(plan: Plan): WindProfile {
  return new WindProfile(plan.winds.layers, planWindOptions(plan));
}

/** Density (kg/m³ at m MSL) from the plan's sounding (docs/model.md §11), or undefined for the ISA. */
export function soundingDensity(plan: Plan): ((z_m: number) => number) | undefined {
  const snd = plan.atmosphere.sounding;
  if (!snd || snd.levels.length === 0) return undefined;
  const atm = new SoundingAtmosphere(snd.levels, {
    reference: snd.reference ?? 'MSL',
    groundElevation_m: plan.groundElevation_m,
    surfacePressure_Pa:
      snd.surfacePressure_hPa === undefined ? undefined : snd.surfacePressure_hPa * 100,
  });
  return (z) => atm.densityAt(z);
}
