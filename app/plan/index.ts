// The plan file: types, JSON Schema, defaults, validation, limits, fingerprint, and the air its fields describe.
// The public face of app/plan/: other folders import from here only.
export { planFingerprint } from './fingerprint';
export {
  type ChecklistItem,
  type NoDropZone,
  type Plan,
  type PlanFile,
  type PlanTerrainFile,
  type ResolvedSite,
  type ResolvedVariant,
  type SafetySection,
  type Signoff,
  type Site,
  type TimedWinds,
  type Variant,
} from './plan';
export { planWindOptions, planWindProfile, soundingDensity } from './plan-air';
export { DEFAULTS, resolvePlan } from './plan-defaults';
export {
  FRAME_LIMIT_M,
  massFactor,
  MAX_PLAN_BYTES,
  MAX_PLAN_FLIGHTS,
  workIssue,
} from './plan-limits';
export { allowedRange, type PlanIssue, type PlanValidation, validatePlan } from './validate';
export { default as planSchema } from './plan.schema.json';
