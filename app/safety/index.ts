// Automatic safety checks, hazard area, crew checklist, readiness and sign-off.
// The public face of app/safety/: other folders import from here only.
export { clearance_m, segDist } from './clearance';
export { circumscribed, type ConvexPiece, hazardArea, hazardPieces } from './hazard-area';
export {
  blockingText,
  checklistOf,
  planSafety,
  type PlanSafety,
  safetySettingsOf,
} from './plan-safety';
export {
  DEFAULT_MANUAL_ITEMS,
  doneWithoutName,
  itemOpen,
  type ManualItem,
  overallReady,
  readiness,
  type Readiness,
  type ReadinessOverride,
} from './readiness';
export {
  type CheckResult,
  type CheckStatus,
  DEFAULT_SAFETY_SETTINGS,
  IMPACT_CAT2_FT_LBF,
  IMPACT_CAT3_FT_LBF,
  impactEnergy_J,
  J_PER_FT_LBF,
  safetyChecks,
  type SafetyReport,
  type SafetySettings,
  siteTouchdowns,
  type Touchdown,
  touchdown,
  windSpeeds,
} from './safety';
