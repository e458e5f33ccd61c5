// The printed products: the brief document, its drawings and plots, the text report, the caution.
// The public face of app/brief/: other folders import from here only.
export {
  briefHtml,
  type BriefOptions,
  type BriefSafety,
  briefTimes,
  scheduleOrder,
} from './brief-html';
export { briefSafety } from './brief-safety';
export { esc, niceStep, overviewSvg, PRINT_COLOURS, windPlotSvg } from './brief-svg';
export { CAUTION_TEXT } from './caution';
export { fallProfileSvg, type FallProfileOptions } from './fall-profile-svg';
export { groundProfileSvg, type GroundProfileOptions } from './ground-profile-svg';
export { formatPlanText } from './report-text';
export { type LabelUnit, type ScatterInput, type ScatterOptions, scatterSvg } from './scatter-svg';
export { isUtc, planZone, type PlanZone, UTC_ZONE, zoneClock, zoneClockText } from './plan-clock';
export {
  type ClockWindowText,
  noWindowText,
  stepText,
  timelineSection,
  timelineWindows,
  type TimelineWindows,
  windowsNote,
} from './timeline-section';
export { timelineSiteIds, timelineSvg } from './timeline-svg';
export { fallTurbulenceText } from './uncertainty-text';
export {
  type HodographOptions,
  type HodographPoint,
  hodographSvg,
  hodographTrace,
  type HodographTrace,
  sweepSvg,
  type SweepSvgOptions,
} from './wind-plots';
