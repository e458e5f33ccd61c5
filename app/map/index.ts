// Leaflet adapters: plan results, the plan's marks and the safety picture → map layers, the
// graticule, tooltips built from text nodes, and the screen layout of lanes and labels.
// The public face of app/map/: other folders import from here only.
export {
  bearingHandle,
  circleRing,
  ellipseRing,
  intervalDecimals,
  niceInterval,
  offsetLine,
  trackSegment,
  type LatLngTuple,
} from './geometry';
export {
  BasemapLayer,
  type BasemapLayerOptions,
  type TileImage,
  type TileReader,
} from './basemap-layer';
export {
  drawVectorTile,
  VECTOR_STYLES,
  VectorBasemapLayer,
  type VectorTileReader,
} from './basemap-vector';
export {
  MAX_MERCATOR_LAT,
  tileCount,
  tileRange,
  tilesOf,
  tileUrlOf,
  tileX,
  tileY,
  type TileArea,
} from './basemap-tiles';
export { defaultLabelFormat, Graticule, graticule, type GraticuleOptions } from './graticule';
export {
  laneSide,
  placeLabels,
  windowLanes,
  type Box,
  type LabelPlace,
  type LabelRequest,
} from './layout';
export {
  buildFocusLayers,
  buildResultLayers,
  DEFAULT_VISIBILITY,
  SHAPE_KINDS,
  type LayerFormat,
  type LayerVisibility,
  type ShapeKind,
} from './plan-layers';
export { decodeMvt, MVT_LIMITS, type MvtFeature, type MvtLayer } from './mvt';
export { releaseMarker, siteIcon, siteMarker, trackHandleMarker, trackLine } from './plan-marks';
export { buildSafetyLayers, drawingOutline } from './safety-layers';
export { TerrainLayer, type TerrainUnits } from './terrain-layer';
export { escapeHtml, lazyTip, tipNode } from './tooltip';
export { buildWindowLayers, type WindowView } from './window-layers';
