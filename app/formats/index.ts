// Outside formats in and out: site import, GeoJSON/KML/GPX/CSV export, winds-aloft text, sounding CSV, surface readings,
// elevation models (GeoTIFF, ESRI ASCII grid).
// The public face of app/formats/: other folders import from here only.
export {
  neutraliseCell,
  toScheduleCSV,
  toSitesCSV,
  UTF8_BOM,
  type CsvOptions,
  type ScheduleOptions,
} from './csv';
export { xmlEscape } from './export-shared';
export {
  toGeoJSON,
  type Feature,
  type FeatureCollection,
  type GeoJSONOptions,
  type Geometry,
  type PolygonGeometry,
  type PolygonInput,
  type Position,
} from './geojson';
export { toGPX } from './gpx';
export { toKML } from './kml';
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
export {
  asciiCornerInMetres,
  readAsciiGrid,
  MAX_ASCII_GRID_CHARS,
  type AsciiGridOptions,
  utmZoneEpsg,
} from './ascii-grid';
export {
  boxText,
  crsConverter,
  Dem,
  DEM_MARGIN_CELLS,
  DemAreaError,
  DemError,
  type DemGrid,
  type GridGeometry,
  type GridWindow,
  type LatLonBox,
  MAX_DEM_CELLS,
  SUPPORTED_CRS_TEXT,
  windowFor,
} from './dem';
export {
  blobSource,
  bufferSource,
  type ByteSource,
  type DemRead,
  type DemReadOptions,
  readGeoTiffDem,
} from './geotiff-dem';
