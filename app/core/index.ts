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
export { MAX_PLAN_FLIGHTS, workIssue } from './plan-limits';
export {
  planWindOptions,
  planWindProfile,
  WindProfile,
  windComponents,
  windFromComponents,
  type WindVector,
} from './wind';
export {
  briefHtml,
  briefTimes,
  scheduleOrder,
  type BriefOptions,
  type BriefSafety,
} from './brief-html';
export { esc, niceStep, overviewSvg, PRINT_COLOURS, windPlotSvg } from './brief-svg';
// Wind and temperature imports: winds-aloft text, sounding files, surface readings, forecast series.
export {
  ForecastSeries,
  pHitTimeline,
  windowsFromTimeline,
  type ClockWindow,
  type TimedProfile,
  type TimelineEntry,
  type TimelineOptions,
} from './forecast-series';
export { SoundingAtmosphere, type SoundingAtmosphereOptions } from './sounding-atmosphere';
export { importSounding, type Sounding, type SoundingProblem } from './sounding-csv';
export {
  fmt as formatCount,
  inSchemaRange,
  MAX_IMPORT_BYTES,
  MAX_LISTED_PROBLEMS,
  onlyFirstMessage,
  rangeProblem,
  schemaBounds,
  schemaMaxItems,
  schemaMaxLength,
  WORKER_IMPORT_BYTES,
  type Bounds,
} from './import-limits';
export {
  blendSurfaceReading,
  HELLMANN_NEUTRAL,
  mergeSurfaceProfile,
  speedRatio,
  surfaceProfile,
  TERRAIN,
  type SurfaceBlend,
  type SurfaceProfileOptions,
  type SurfaceReading,
  type Terrain,
  type TerrainClass,
} from './surface-wind';
export {
  decodeWindsAloft,
  stationLayers,
  type StationLayers,
  type StationLayersOptions,
  type WindsAloft,
  type WindsAloftLayer,
  type WindsAloftStation,
} from './winds-aloft';
// Safety checks, hazard area, readiness and sun (civil twilight).
export {
  circumscribed,
  clearance_m,
  hazardArea,
  hazardPieces,
  type ConvexPiece,
} from './hazard-area';
export {
  DEFAULT_MANUAL_ITEMS,
  overallReady,
  readiness,
  type ManualItem,
  type Readiness,
  type ReadinessOverride,
} from './readiness';
export {
  DEFAULT_SAFETY_SETTINGS,
  IMPACT_CAT2_FT_LBF,
  IMPACT_CAT3_FT_LBF,
  J_PER_FT_LBF,
  impactEnergy_J,
  safetyChecks,
  windSpeeds,
  type CheckResult,
  type CheckStatus,
  type SafetyReport,
  type SafetySettings,
} from './safety';
export {
  civilTwilight,
  solarCoordinates,
  sunElevationDeg,
  type CivilTwilight,
  type SolarCoordinates,
} from './sun';
// Exports to GeoJSON, KML, GPX and CSV; site import from CSV, GeoJSON and KML.
export {
  toGeoJSON,
  toGPX,
  toKML,
  toScheduleCSV,
  toSitesCSV,
  neutraliseCell,
  UTF8_BOM,
  xmlEscape,
  type CsvOptions,
  type Feature,
  type FeatureCollection,
  type GeoJSONOptions,
  type Geometry,
  type PolygonGeometry,
  type PolygonInput,
  type Position,
  type ScheduleOptions,
} from './export-formats';
export {
  importSites,
  type ImportOptions,
  type ImportProblem,
  type ImportResult,
  type XmlParser,
} from './import-sites';
export {
  blockingText,
  briefSafety,
  checklistOf,
  planFingerprint,
  planSafety,
  safetySettingsOf,
  type PlanSafety,
} from './plan-safety';
// Wind hodograph and release-altitude sweep (SVG strings for the brief and the UI).
export {
  altitudeSweep,
  sweepHeightsAGL,
  hodographSvg,
  hodographTrace,
  sweepSvg,
  type HodographOptions,
  type HodographPoint,
  type HodographTrace,
  type SweepPoint,
  type SweepSvgOptions,
} from './wind-plots';
