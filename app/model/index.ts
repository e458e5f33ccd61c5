// The physics and statistics on plain numbers: air, wind, fall tables, flights, dispersion, release windows, rng, geodesy, declination, sun.
// The public face of app/model/: other folders import from here only.
export {
  airAt,
  type AirState,
  densityAt,
  geopotentialAltitude,
  isaAtGeopotential,
} from './atmosphere';
export { DEFAULT_SURFACE_EXPONENT, G0, M_PER_FT, MPS_PER_KT, RHO0 } from './constants';
export { formatDecimal, formatDMS, formatUTM, fromUTM, parseCoordinate, toMGRS } from './coords';
export {
  type Declination,
  magneticDeclination,
  magneticHeading,
  WMM_VALIDITY,
} from './declination';
export {
  covarianceEllipse,
  type Dispersion,
  ellipseScale,
  type LocalEllipse,
  summarize,
} from './dispersion';
export { FallTable, type FallTableInput } from './fall-table';
export {
  AltitudePath,
  altitudePath,
  fixedHeadingProgramme,
  type FlightSetup,
  type FlightTerrain,
  flySamples,
  forwardThrow,
  nominalPath,
  passiveOffset,
  pathTimeAt,
  type Programme,
  reachRadius,
  type SampleRequest,
  type Vec,
} from './flight';
export {
  bearingDeg,
  destination,
  distance_m,
  type LatLon,
  LocalFrame,
  type LocalXY,
} from './geodesy';
export { naiveFlight, type NaiveFlight } from './naive-integrator';
export {
  bestShift,
  bisectEdge,
  hitProfile,
  type HitProfile,
  profileAt,
  runAround,
  searchEdge,
} from './release-window';
export { alongTrack, ellipseRingLatLon } from './rings';
export { hashLabel, Rng, streamSeed } from './rng';
export { SoundingAtmosphere, type SoundingAtmosphereOptions } from './sounding-atmosphere';
export {
  civilTwilight,
  type CivilTwilight,
  solarCoordinates,
  type SolarCoordinates,
  sunElevationDeg,
} from './sun';
export {
  HELLMANN_NEUTRAL,
  mergeSurfaceProfile,
  speedRatio,
  surfaceProfile,
  type SurfaceProfileOptions,
  type SurfaceReading,
  type Terrain,
  TERRAIN,
  type TerrainClass,
} from './surface-wind';
export {
  CROSS_GROUND,
  CROSS_NO_DATA,
  CROSS_NONE,
  CROSS_START_BELOW,
  type Crossing,
  type CrossingOptions,
  type DescentPath,
  type ElevationModel,
  fastCrossing,
  firstCrossing,
  flatGround,
  glideRays,
  type GridMap,
  GridGround,
  type Ground,
  groundCrossing,
  hiddenGround,
  linePath,
  type LocalBox,
  MIN_REACH_RAYS,
  type PathAt,
  type PathPoint,
  type ReachPolygon,
  reachPolygon,
  sampledGround,
  type SiteView,
  type TerrainGround,
} from './terrain';
export {
  CLASS_W20_MPS,
  classW20,
  type FallTurbulence,
  fallTurbulence,
  lowAltitudeTurbulence,
  type TurbulenceAt,
  type TurbulenceSpec,
  W20_HEIGHT_M,
} from './turbulence';
export {
  type AltitudeReference,
  type Guidance,
  type TurbulenceClass,
  type Uncertainty,
  type WindLayer,
} from './types';
export {
  windComponents,
  windFromComponents,
  WindProfile,
  type WindProfileOptions,
  type WindVector,
} from './wind';
