// Whether the plan's wind layers cover the fall (docs/model.md §2): a profile whose lowest layer
// is above the release (a winds-aloft bulletin at a low site) is extrapolated through the whole
// fall, and one whose top layer is below the release holds that layer's wind above it.
import { type Plan, planWindProfile } from '../plan';

/** Release above the top layer by more than this (m) is worth a word; less is rounding. */
const TOP_SLACK_M = 10;

const m0 = (x: number): string => `${Math.round(x)} m`;

/** Warnings (plain sentences, starting "winds:") when the layers do not cover the fall. */
export function windCoverageWarnings(plan: Plan, releaseMSL_m: number): string[] {
  const wind = planWindProfile(plan);
  const z = wind.z;
  if (z.length === 0)
    return ['winds: no wind layers, so calm air is assumed through the whole fall'];
  const ground = plan.groundElevation_m;
  const ref = plan.winds.reference === 'AGL' ? 'above the plan ground' : 'MSL';
  const shown = (zMSL: number): string => m0(plan.winds.reference === 'AGL' ? zMSL - ground : zMSL);
  const out: string[] = [];
  const low = z[0];
  const high = z[z.length - 1];
  if (low > releaseMSL_m) {
    out.push(
      `winds: the lowest wind layer (${shown(low)} ${ref}) is ${m0(low - releaseMSL_m)} above the ` +
        `release, so the whole fall uses wind extrapolated down from it ` +
        `(power law, α = ${plan.winds.surfaceExponent.toFixed(3)}); add a layer near the ground`,
    );
  }
  if (releaseMSL_m - high > TOP_SLACK_M) {
    out.push(
      `winds: the top wind layer (${shown(high)} ${ref}) is ${m0(releaseMSL_m - high)} below the ` +
        `release, so the top ${m0(releaseMSL_m - high)} of the fall use that layer's wind unchanged`,
    );
  }
  return out;
}
