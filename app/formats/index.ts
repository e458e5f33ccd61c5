// Outside formats in and out: site import, GeoJSON/KML/GPX/CSV export, winds-aloft text, sounding CSV, surface readings.
// The public face of app/formats/: other folders import from here only.
export {
  type CsvOptions,
  type Feature,
  type FeatureCollection,
  type GeoJSONOptions,
  type Geometry,
  neutraliseCell,
  type PolygonGeometry,
  type PolygonInput,
  type Position,
  type ScheduleOptions,
  toGeoJSON,
  toGPX,
  toKML,
  toScheduleCSV,
  toSitesCSV,
  UTF8_BOM,
  xmlEscape,
} from './export-formats';
export {
  type Bounds,
  fmt,
  inSchemaRange,
  MAX_IMPORT_BYTES,
  MAX_LISTED_PROBLEMS,
  onlyFirstMessage,
  rangeProblem,
  schemaBounds,
  schemaMaxItems,
  schemaMaxLength,
  WORKER_IMPORT_BYTES,
} from './import-limits';
export {
  type ImportOptions,
  type ImportProblem,
  type ImportResult,
  importSites,
  type XmlParser,
} from './import-sites';
export { importSounding, type Sounding, type SoundingProblem } from './sounding-csv';
export { blendSurfaceReading, type SurfaceBlend } from './surface-reading';
export {
  decodeWindsAloft,
  stationLayers,
  type StationLayers,
  type StationLayersOptions,
  type WindsAloft,
  type WindsAloftLayer,
  type WindsAloftStation,
} from './winds-aloft';
