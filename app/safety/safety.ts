/**
 * Automatic pre-release safety checks, recomputed from a plan, its result and the safety
 * settings, and the readiness rule that combines them with the crew's manual checklist.
 * Figures from published rules are shown for orientation only: local rules govern.
 */
import type { Plan } from '../plan';
import type { PlanResult } from '../planner';
import {
  type CheckResult,
  DEFAULT_SAFETY_SETTINGS,
  type SafetyReport,
  type SafetySettings,
} from './check-result';
import { ceilingCheck, noDropCheck, windCheck, windCoverageCheck } from './checks-area';
import { daylightCheck, magneticCheck } from './checks-sky';
import { terrainClearanceCheck } from './checks-terrain';
import { batteryCheck, energyCheck, pHitCheck } from './checks-vehicle';
import { hazardArea } from './hazard-area';
export {
  DEFAULT_SAFETY_SETTINGS,
  windSpeeds,
  type CheckResult,
  type CheckStatus,
  type SafetyReport,
  type SafetySettings,
} from './check-result';
export {
  IMPACT_CAT2_FT_LBF,
  IMPACT_CAT3_FT_LBF,
  impactEnergy_J,
  J_PER_FT_LBF,
  siteTouchdowns,
  type Touchdown,
  touchdown,
} from './checks-vehicle';

/** Every automatic check for a plan and its result, plus the hazard area (m²). */
export function safetyChecks(
  plan: Plan,
  result: PlanResult,
  settings: SafetySettings = DEFAULT_SAFETY_SETTINGS,
): SafetyReport {
  const hz = hazardArea(result, settings.hazardBuffer_m);
  const vertices =
    hz.feature.geometry.type === 'Polygon'
      ? [hz.feature.geometry.coordinates]
      : hz.feature.geometry.coordinates;
  const hazard: CheckResult = {
    id: 'hazard-area',
    title: 'Hazard area',
    status: 'pass',
    why:
      `Every 99 % landing ellipse swept over its release window, and the ground under the ` +
      `release, grown by ${settings.hazardBuffer_m} m: ${Math.round(hz.area_m2)} m². Keep people out of it.`,
    numbers: { area_m2: Math.round(hz.area_m2), buffer_m: settings.hazardBuffer_m },
    items: vertices.flatMap((poly, part) =>
      poly.flatMap((ring, r) => ring.map(([lon, lat]) => ({ part, ring: r, lat, lon }))),
    ),
  };
  return {
    checks: [
      windCheck(plan, result),
      windCoverageCheck(plan, result),
      ceilingCheck(plan, result, settings),
      terrainClearanceCheck(result, settings),
      noDropCheck(result, settings),
      hazard,
      energyCheck(plan, result),
      magneticCheck(plan, result),
      daylightCheck(plan, result),
      batteryCheck(plan, result, settings),
      pHitCheck(plan, result),
    ],
    hazardArea: hz.feature,
    hazardArea_m2: hz.area_m2,
  };
}
