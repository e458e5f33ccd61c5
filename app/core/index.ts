// Public exports of the planning core (pure TypeScript: runs in Node, the browser and workers).
export {
  airAt,
  densityAt,
  geopotentialAltitude,
  isaAtGeopotential,
  type AirState,
} from './atmosphere';
export { CAUTION_TEXT } from './caution';
export * as constants from './constants';
export {
  magneticDeclination,
  magneticHeading,
  WMM_VALIDITY,
  type Declination,
} from './declination';
export {
  covarianceEllipse,
  ellipseScale,
  summarize,
  type Dispersion,
  type LocalEllipse,
} from './dispersion';
export { FallTable, type FallTableInput } from './fall-table';
export {
  fixedHeadingProgramme,
  flySamples,
  forwardThrow,
  passiveOffset,
  reachRadius,
  type FlightSetup,
  type Programme,
  type SampleRequest,
  type Vec,
} from './flight';
export {
  bearingDeg,
  destination,
  distance_m,
  LocalFrame,
  type LatLon,
  type LocalXY,
} from './geodesy';
export { naiveFlight, type NaiveFlight } from './naive-integrator';
export type * from './plan';
export { DEFAULTS, resolvePlan } from './plan-defaults';
export {
  planDrop,
  type GeoEllipse,
  type PlanOptions,
  type PlanResult,
  type SiteResult,
  type VariantResult,
} from './planner';
export {
  bestShift,
  bisectEdge,
  hitProfile,
  profileAt,
  runAround,
  type HitProfile,
} from './release-window';
export { formatPlanText } from './report-text';
export { Rng, streamSeed } from './rng';
export { validatePlan, type PlanIssue, type PlanValidation } from './validate';
export { WindProfile, windComponents, windFromComponents, type WindVector } from './wind';
export {
  briefHtml,
  briefTimes,
  scheduleOrder,
  type BriefOptions,
  type BriefSafety,
} from './brief-html';
export { esc, niceStep, overviewSvg, PRINT_COLOURS, windPlotSvg } from './brief-svg';
