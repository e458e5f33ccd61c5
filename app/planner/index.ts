// What turns a plan into results: the planner, altitude sweeps, forecast timelines.
// The public face of app/planner/: other folders import from here only.
export {
  type ClockWindow,
  ForecastSeries,
  pHitTimeline,
  type TimedProfile,
  type TimelineEntry,
  type TimelineOptions,
  windowsFromTimeline,
} from './forecast-series';
export {
  type ErrorSource,
  errorSources,
  includedText,
  pHitParts,
  pHitText,
  turbulenceText,
} from './error-sources';
export {
  BRIEF_TIMELINE_MAX_FLIGHTS,
  planForecastSeries,
  planTimeline,
  TIMELINE_MAX_STEPS,
  TIMELINE_STEP_S,
  timelineFlights,
  timelineSamples,
} from './plan-timeline';
export { type Candidate, recommend, type Recommendation } from './recommend';
export { windCoverageWarnings } from './wind-coverage';
export { planDrop } from './planner';
export {
  type CarrierGroundPoint,
  type FallProfilePoint,
  type GeoEllipse,
  type GeoPolygon,
  type HiddenBy,
  type PlanOptions,
  type PlanTerrain,
  type PlanResult,
  type ReleaseWindow,
  type ReleaseZone,
  type SiteGround,
  type SiteResult,
  type VariantResult,
  type VariantTerrain,
} from './results';
export { altitudeSweep, sweepHeightsAGL, type SweepPoint } from './sweeps';
export {
  evenIndices,
  type FallProfile,
  type SiteEllipse,
  type SiteSamples,
  siteSamples,
  type SiteSamplesOptions,
} from './site-samples';
export {
  type AreaBox,
  MAX_TERRAIN_MARGIN_M,
  terrainArea,
  terrainLocalBox,
  terrainMargin_m,
} from './terrain-area';
