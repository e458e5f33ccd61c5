// CSV (RFC 4180): the release schedule and the sites written, and sites read (header, delimiter
// and decimal-comma detection; positions in csv-position.ts). Cells that could start a formula
// are neutralised.
import Papa from 'papaparse';
import { formatUTM, type LatLon, toMGRS } from '../model';
import type { Plan, Site } from '../plan';
import type { PlanResult } from '../planner';
import {
  csvRows,
  detectDelimiter,
  layoutOf,
  trimEnd,
  type Col,
  type Layout,
  type Row,
} from './csv-layout';
import { csvPosition } from './csv-position';
import { moving, r7, round } from './export-shared';
import {
  IdPool,
  type ImportOptions,
  NAME_MAX,
  optionalNumber,
  type Problems,
  type ReadTarget,
  Sink,
  type Where,
} from './site-reading';

export interface CsvOptions {
  /** Start with a UTF-8 byte-order mark, so spreadsheets read accented names as UTF-8. */
  bom?: boolean;
}

export interface ScheduleOptions extends CsvOptions {
  /** Coordinate columns to write; all three forms when absent. */
  coords?: 'decimal' | 'utm' | 'mgrs';
}

export const CSV_CONFIG = { newline: '\r\n', quotes: false } as const;

/** The UTF-8 byte-order mark (U+FEFF) that `bom: true` puts first. */
export const UTF8_BOM = '\uFEFF';

// OWASP "CSV Injection": a cell starting with =, +, -, @, tab or carriage return is read as a
// formula by spreadsheets; OWASP ASVS 5.0 V1.2.10 adds NUL.
export const FORMULA_START = /^[=+\-@\t\r\0]/;

/**
 * A text cell made inert for spreadsheets: a single quote put before text that starts with
 * = + - @, tab, carriage return or NUL (OWASP CSV Injection). Other text is unchanged.
 */
export function neutraliseCell(text: string): string {
  return FORMULA_START.test(text) ? `'${text}` : text;
}

/**
 * RFC 4180 text: papaparse quotes fields holding a comma, quote, CR or LF and doubles quotes;
 * every record ends CRLF. Text cells (ids, names) are neutralised; numbers the exporter writes
 * itself (a longitude of -12.5) are numbers, not text, and stay as they are.
 */
export function csv(fields: string[], rows: unknown[][], opts: CsvOptions = {}): string {
  const data = rows.map((row) => row.map((c) => (typeof c === 'string' ? neutraliseCell(c) : c)));
  return (opts.bom ? UTF8_BOM : '') + Papa.unparse({ fields, data }, CSV_CONFIG) + '\r\n';
}

export const blank = (x: number | null | undefined, d: number): number | string =>
  x === null || x === undefined || !Number.isFinite(x) ? '' : round(x, d);

export function safeMGRS(p: LatLon): string {
  try {
    return toMGRS(p, 5);
  } catch {
    return ''; // outside MGRS's UTM latitudes (80°S–84°N)
  }
}

/**
 * Release schedule, one row per site in release order (by release time on a moving carrier,
 * else plan order). Times are s relative to passing the plan's release point. Empty cells mean
 * "not applicable" (no window, no heading programme, hovering). MGRS is empty outside 80°S–84°N.
 */
export function toScheduleCSV(plan: Plan, result: PlanResult, opts: ScheduleOptions = {}): string {
  const want = (k: 'decimal' | 'utm' | 'mgrs'): boolean =>
    opts.coords === undefined || opts.coords === k;
  const fields = [
    'order',
    'site',
    'name',
    'variant',
    'recommendation',
    ...(want('decimal') ? ['release_lat', 'release_lon'] : []),
    ...(want('utm') ? ['release_utm'] : []),
    ...(want('mgrs') ? ['release_mgrs'] : []),
    'release_altitude_agl_m',
    'release_altitude_msl_m',
    'carrier_track_deg',
    'window_open_s',
    'window_close_s',
    'best_s',
    'hover_zone_radius_m',
    'heading_true_deg',
    'heading_mag_deg',
    'thrust_s',
    'p_hit',
    'p_hit_se',
    'cep_m',
    'ellipse95_major_m',
    'ellipse95_minor_m',
    'ellipse95_azimuth_deg',
  ];
  const rows = [...result.sites];
  if (moving(result)) rows.sort((a, b) => a.release.time_s - b.release.time_s);
  const data = rows.map((r, i) => {
    const p = r.release;
    const w = r.releaseWindow;
    return [
      i + 1,
      r.id,
      r.name,
      r.variant,
      r.recommendation.kind,
      ...(want('decimal') ? [r7(p.lat), r7(p.lon)] : []),
      ...(want('utm') ? [formatUTM(p)] : []),
      ...(want('mgrs') ? [safeMGRS(p)] : []),
      round(result.releaseAltitudeMSL_m - plan.groundElevation_m, 1),
      round(result.releaseAltitudeMSL_m, 1),
      moving(result) ? result.track.trackDeg : '',
      blank(w?.open_s, 2),
      blank(w?.close_s, 2),
      blank(w?.best_s, 2),
      blank(r.releaseZone?.radius_m, 1),
      blank(r.headingTrue_deg, 1),
      blank(r.headingMag_deg, 1),
      blank(r.thrustTime_s, 2),
      round(r.pHit, 4),
      round(r.pHitSE, 4),
      round(r.cep_m, 2),
      round(r.ellipse95.semiMajor_m, 2),
      round(r.ellipse95.semiMinor_m, 2),
      round(r.ellipse95.azimuth_deg, 1),
    ];
  });
  return csv(fields, data, opts);
}

/** The plan's sites as CSV (id, name, lat, lon, elevation_m, tolerance_m, variant), readable by importSites. */
export function toSitesCSV(plan: Plan, opts: CsvOptions = {}): string {
  const fields = ['id', 'name', 'lat', 'lon', 'elevation_m', 'tolerance_m', 'variant'];
  const data = plan.sites.map((s) => [
    s.id,
    s.name,
    r7(s.lat),
    r7(s.lon),
    s.elevation_m,
    s.tolerance_m,
    s.variant ?? '',
  ]);
  return csv(fields, data, opts);
}
export function readCSV(text: string, opts: ImportOptions, to: ReadTarget): void {
  const { ids, sink, problems } = to;
  const delimiter = opts.delimiter ?? detectDelimiter(text);
  const dc = delimiter !== ',';
  let layout: Layout | undefined;
  csvRows(text, delimiter, problems, (row) => {
    if (!layout) {
      layout = layoutOf(row, dc, problems);
      if (!layout) return false;
      if (layout.header) return true;
    }
    if (!sink.accepts()) return false;
    readRow(row, layout, dc, delimiter, ids, sink, problems);
    return true;
  });
}

export function readRow(
  row: Row,
  { cols, width, header, coordWidth }: Layout,
  dc: boolean,
  delimiter: string,
  ids: IdPool,
  sink: Sink,
  problems: Problems,
): void {
  const where = { line: row.line };
  const bad = (message: string): void => {
    problems.push({ line: row.line, message: `line ${row.line}: ${message}; row not imported` });
  };
  const cells = trimEnd(row.cells);
  if (cells.length > width) {
    // "a1,47,5,21,5" under "id,lat,lon": decimal commas split the numbers into more fields.
    const hint =
      delimiter === ',' ? ' — decimal commas? use ; as separator or . as decimal point' : '';
    bad(
      header
        ? `row has ${cells.length} fields, header has ${width}${hint}`
        : `row has ${cells.length} fields, the first row has ${width} and there is no header to name the rest${hint}`,
    );
    return;
  }
  // A quote before = + - @ tab CR NUL is the CSV exports' formula guard (OWASP CSV Injection),
  // not part of the value: read it off, as a spreadsheet does.
  const get = (c: Col): string => {
    const i = cols.get(c);
    return i === undefined ? '' : (cells[i] ?? '').trim().replace(/^'(?=[=+\-@\t\r\0])/, '');
  };
  const pos = csvPosition(get, cols, dc);
  if ('message' in pos) {
    const short = row.cells.length < coordWidth && /no coordinates|is empty/.test(pos.message);
    bad(
      short ? `only ${row.cells.length} field(s), the coordinates need ${coordWidth}` : pos.message,
    );
    return;
  }
  const far = sink.tooFar(pos);
  if (far) return bad(far);
  const ele = optionalNumber(get('elevation'), 'elevation_m', dc);
  if (!ele.ok) return bad(ele.message);
  const tol = optionalNumber(get('tolerance'), 'tolerance_m', dc);
  if (!tol.ok) return bad(tol.message);
  const rawId = get('id') || undefined;
  const rawName = get('name') || undefined;
  sink.sites.push(
    makeSite(ids, where, rawId, rawName, false, pos, ele.value, tol.value, get('variant')),
  );
}

export function makeSite(
  ids: IdPool,
  where: Where,
  rawId: string | undefined,
  rawName: string | undefined,
  idFromName: boolean,
  p: { lat: number; lon: number },
  elevation_m: number | undefined,
  tolerance_m: number | undefined,
  variant: string | undefined,
): Site {
  const id =
    rawId !== undefined
      ? ids.claim(rawId, where)
      : ids.claim(idFromName ? rawName : undefined, where, true);
  const site: Site = { id, lat: p.lat, lon: p.lon };
  let name = rawName?.trim();
  if (name && name.length > NAME_MAX) {
    ids.report(where, `name is longer than ${NAME_MAX} characters; shortened`);
    name = name.slice(0, NAME_MAX);
  }
  if (name && name !== id) site.name = name;
  if (elevation_m !== undefined) site.elevation_m = elevation_m;
  if (tolerance_m !== undefined) site.tolerance_m = tolerance_m;
  const v = ids.variant(variant, where);
  if (v !== undefined) site.variant = v;
  return site;
}
