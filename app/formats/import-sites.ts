/**
 * Sites read from CSV (RFC 4180 and its everyday variants), GeoJSON (RFC 7946) or KML 2.2.
 * Every row or feature that is not imported is reported with its line or feature index and the
 * reason; good rows are kept. Never throws.
 *
 * KML needs an XML parser: `opts.parseXml` when given, else the platform's DOMParser (browser
 * main thread), else @xmldom/xmldom (Node, Web Workers).
 *
 * Limits follow the importers' one rule (import-limits.ts): reading stops once the plan's site
 * limit is reached ("only the first N sites were read"), a value outside the schema's range keeps
 * its site out with the field and range named, and files over MAX_IMPORT_BYTES are refused.
 */
import { kmlGen } from '@tmcw/togeojson';
import { DOMParser as XmldomParser } from '@xmldom/xmldom';
import Papa from 'papaparse';
import { distance_m, fromUTM, parseCoordinate } from '../model';
import {
  fmt,
  MAX_IMPORT_BYTES,
  onlyFirstMessage,
  ProblemList,
  rangeProblem,
  schemaMaxItems,
  schemaMaxLength,
} from './import-limits';
import { planSchema as schema, type Site } from '../plan';

export interface ImportProblem {
  /** 1-based line of the text (CSV rows, XML and JSON syntax errors). */
  line?: number;
  /** 0-based index into the GeoJSON features (or KML placemarks in document order). */
  feature?: number;
  message: string;
}

export interface ImportResult {
  sites: Site[];
  problems: ImportProblem[];
}

/** Parses XML text into a DOM Document; errors are thrown or reported as <parsererror>. */
export type XmlParser = (text: string) => Document;

export interface ImportOptions {
  /** Ids already in the plan: generated ids avoid them and imported ids that collide are renamed. */
  existingIds?: Iterable<string>;
  /** Variant ids of the plan; a site naming another variant is imported without it (reported). */
  variantIds?: Iterable<string>;
  /** CSV delimiter; detected from the first line when absent. */
  delimiter?: ',' | ';' | '\t';
  /** XML parser for KML (see the module comment). */
  parseXml?: XmlParser;
  /**
   * The plan's release point and how far from it sites may lie (the plan's limit across fields,
   * FRAME_LIMIT_M in plan-limits.ts): farther sites are not imported, with the distance and, when
   * swapping latitude and longitude would bring them in range, that hint.
   */
  near?: { lat: number; lon: number; maxDistance_m: number };
}

type Problems = ProblemList<ImportProblem>;
type Where = { line?: number; feature?: number };

/** Where read sites go: at most `room` of them (the plan's limit less the sites it has). */
class Sink {
  readonly sites: Site[] = [];
  /** Set when more sites followed after the sink was full: reading stopped there. */
  cut = false;
  constructor(
    readonly room: number,
    private near?: ImportOptions['near'],
  ) {}
  /** Why a position cannot be a site of this plan (too far from the release), or undefined. */
  tooFar(p: { lat: number; lon: number }, order?: string): string | undefined {
    const n = this.near;
    if (!n) return undefined;
    const d = distance_m(n, p);
    if (d <= n.maxDistance_m) return undefined;
    const km = (m: number) => `${(m / 1000).toFixed(1)} km`;
    const swapped = { lat: p.lon, lon: p.lat };
    const hint =
      Math.abs(swapped.lat) <= 90 && distance_m(n, swapped) <= n.maxDistance_m
        ? ` — latitude and longitude swapped?${order ? ` (${order})` : ''}`
        : '';
    return `the site is ${km(d)} from the release point; the plan holds sites within ${km(n.maxDistance_m)} of it${hint}`;
  }
  /** False (and `cut` set) when the plan has no room for another site. */
  accepts(): boolean {
    if (this.sites.length < this.room) return true;
    this.cut = true;
    return false;
  }
}

/** Reads sites from text: kind 'auto' picks KML for '<…', GeoJSON for '{…' or '[…', else CSV. */
export function importSites(
  text: string,
  kind: 'csv' | 'geojson' | 'kml' | 'auto',
  opts: ImportOptions = {},
): ImportResult {
  const problems: Problems = new ProblemList();
  const ids = new IdPool(opts, problems);
  const max = schemaMaxItems('sites');
  const sink = new Sink(Math.max(0, max - ids.existing), opts.near);
  const raw = String(text ?? '');
  if (raw.length > MAX_IMPORT_BYTES) {
    problems.push({
      message: `the file is larger than ${fmt(MAX_IMPORT_BYTES / 1048576)} MB, the most an import reads; nothing was read`,
    });
    return { sites: [], problems: problems.items };
  }
  try {
    const body = raw.replace(/^\uFEFF/, '');
    const head = body.trimStart()[0];
    const k =
      kind !== 'auto'
        ? kind
        : head === '<'
          ? 'kml'
          : head === '{' || head === '['
            ? 'geojson'
            : 'csv';
    if (k === 'csv') readCSV(body, opts, ids, sink, problems);
    else if (k === 'geojson') readGeoJSON(body, ids, sink, problems);
    else readKML(body, opts, ids, sink, problems);
  } catch (e) {
    problems.push({ message: `the file could not be read: ${(e as Error)?.message ?? String(e)}` });
  }
  const sites = sink.sites;
  const out = problems.items;
  const tail = problems.tail();
  if (tail) out.push({ message: tail });
  if (sink.cut) {
    out.push({
      message:
        sink.room === 0
          ? `the plan already holds ${fmt(max)} sites, the most it can; no sites were read`
          : onlyFirstMessage(sites.length, 'sites', max, ids.existing),
    });
  }
  if (sites.length === 0 && out.length === 0) out.push({ message: 'the file holds no sites' });
  return { sites, problems: out };
}

// ---------------------------------------------------------------- ids and field values

// Plan schema "id": its pattern and length, read from the schema.
const ID_RE = new RegExp(schema.definitions.id.pattern, 'u');
const ID_MAX = schemaMaxLength('sites[].id');
const NAME_MAX = schemaMaxLength('sites[].name');

class IdPool {
  private taken = new Set<string>();
  private next = 1;
  private variants?: Set<string>;
  /** How many sites the plan holds already (one per existing id given). */
  readonly existing: number = 0;
  constructor(
    opts: ImportOptions,
    private problems: Problems,
  ) {
    for (const id of opts.existingIds ?? []) {
      this.taken.add(id);
      this.existing++;
    }
    if (opts.variantIds) this.variants = new Set(opts.variantIds);
  }
  private fresh(): string {
    for (;;) {
      const id = `s${String(this.next++).padStart(2, '0')}`;
      if (!this.taken.has(id)) return id;
    }
  }
  /** A unique valid id: the wanted one when free and valid, else a generated sNN (reported). */
  claim(wanted: string | undefined, where: Where, fromName = false): string {
    let id: string;
    const w = wanted?.trim();
    if (!w) id = this.fresh();
    else if (w.length > ID_MAX || !ID_RE.test(w)) {
      id = this.fresh();
      if (!fromName)
        this.report(
          where,
          `id "${clip(w)}" is not usable (1–${ID_MAX} printable characters); imported as "${id}"`,
        );
    } else if (this.taken.has(w)) {
      id = this.fresh();
      if (!fromName) this.report(where, `id "${clip(w)}" is already taken; imported as "${id}"`);
    } else id = w;
    this.taken.add(id);
    return id;
  }
  variant(v: string | undefined, where: Where): string | undefined {
    const t = v?.trim();
    if (!t) return undefined;
    if (this.variants && !this.variants.has(t)) {
      this.report(
        where,
        `variant "${clip(t)}" is not in the plan; the site is imported without a pinned variant`,
      );
      return undefined;
    }
    if (!ID_RE.test(t) || t.length > ID_MAX) {
      this.report(where, `variant "${clip(t)}" is not a usable id; ignored`);
      return undefined;
    }
    return t;
  }
  report(where: Where, message: string): void {
    this.problems.push({ ...where, message: `${label(where)}: ${message}` });
  }
}

const clip = (s: string, n = 40): string => (s.length > n ? `${s.slice(0, n)}…` : s);
const label = (w: Where): string =>
  w.line !== undefined
    ? `line ${w.line}`
    : w.feature !== undefined
      ? `features[${w.feature}]`
      : 'file';

const NUM_RE = /^[+-]?(?:\d+\.?\d*|\.\d+)(?:e[+-]?\d+)?$/i;

/** A number cell: plain decimal, or with a decimal comma when the delimiter is ';' or tab. */
function toNumber(cell: string, decimalComma: boolean): number | undefined {
  let t = cell.trim().replace(/^\u2212/, '-');
  if (decimalComma && /^[+-]?\d*,\d+$/.test(t)) t = t.replace(',', '.');
  return NUM_RE.test(t) ? Number(t) : undefined;
}

type Value<T> = { ok: true; value: T } | { ok: false; message: string };

/** Optional numeric site field, checked against the plan schema's range. */
function optionalNumber(
  raw: unknown,
  what: 'elevation_m' | 'tolerance_m',
  decimalComma: boolean,
): Value<number | undefined> {
  if (raw === undefined || raw === null || (typeof raw === 'string' && raw.trim() === ''))
    return { ok: true, value: undefined };
  const v =
    typeof raw === 'number'
      ? raw
      : typeof raw === 'string'
        ? toNumber(raw, decimalComma)
        : undefined;
  if (v === undefined || !Number.isFinite(v))
    return { ok: false, message: `${what} "${clip(String(raw))}" is not a number` };
  const bad = rangeProblem(`sites[].${what}`, v);
  return bad ? { ok: false, message: bad } : { ok: true, value: v };
}

function checkLatLon(
  lat: number,
  lon: number,
  latText = String(lat),
  lonText = String(lon),
): string | undefined {
  if (!Number.isFinite(lat)) return `latitude "${clip(latText)}" is not a number`;
  if (!Number.isFinite(lon)) return `longitude "${clip(lonText)}" is not a number`;
  return rangeProblem('sites[].lat', lat) ?? rangeProblem('sites[].lon', lon);
}

// ---------------------------------------------------------------- CSV

type Col =
  | 'id'
  | 'name'
  | 'lat'
  | 'lon'
  | 'easting'
  | 'northing'
  | 'zone'
  | 'hemisphere'
  | 'band'
  | 'mgrs'
  | 'position'
  | 'elevation'
  | 'tolerance'
  | 'variant';

const ALIASES: Record<string, Col> = {};
for (const [col, names] of Object.entries({
  id: 'id site site_id siteid',
  name: 'name label site_name title',
  lat: 'lat latitude y',
  lon: 'lon lng long longitude x',
  easting: 'easting east e utm_easting',
  northing: 'northing north n utm_northing',
  zone: 'zone utm_zone',
  hemisphere: 'hemisphere hemi',
  band: 'band latitude_band lat_band',
  mgrs: 'mgrs mgrs_ref',
  position: 'position coordinates coordinate coords location',
  elevation: 'elevation ele elev alt altitude',
  tolerance: 'tolerance tol',
  variant: 'variant',
})) {
  for (const n of names.split(' ')) ALIASES[n] = col as Col;
}

/** Header cell → column: case-insensitive, bracketed notes and a trailing _m / _deg unit dropped. */
function columnOf(cell: string): Col | undefined {
  const key = cell
    .toLowerCase()
    .replace(/[([].*?[)\]]/g, ' ')
    .trim()
    .replace(/[^a-z0-9]+/g, '_')
    .replace(/^_+|_+$/g, '')
    .replace(/_(m|deg|dd|degrees|metres|meters)$/, '');
  return ALIASES[key];
}

function detectDelimiter(text: string): ',' | ';' | '\t' {
  // The first non-blank line only: never split a whole (possibly huge) file.
  let at = 0;
  let first = '';
  while (at < text.length) {
    const nl = text.indexOf('\n', at);
    const line = text.slice(at, nl < 0 ? text.length : nl);
    if (line.trim() !== '') {
      first = line;
      break;
    }
    if (nl < 0) break;
    at = nl + 1;
  }
  const bare = first.replace(/"(?:[^"]|"")*"/g, '');
  return bare.includes('\t') ? '\t' : bare.includes(';') ? ';' : ',';
}

/** True when a cell looks like a coordinate or number (so the row is data, not a header). */
function looksNumeric(cell: string, decimalComma: boolean): boolean {
  const t = cell.trim();
  if (t === '') return false;
  if (toNumber(t, decimalComma) !== undefined) return true;
  if (/\d/.test(t) && /[°'"′″]|^\d+\s+\d/.test(t)) return true;
  return parseCoordinate(t).ok;
}

interface Row {
  line: number;
  cells: string[];
}

/** Streams the rows to `onRow` until it returns false; parsing stops there (papaparse abort). */
function csvRows(
  text: string,
  delimiter: string,
  problems: Problems,
  onRow: (row: Row) => boolean,
): void {
  const norm = text.replace(/\r\n?/g, '\n');
  let cursor = 0;
  let line = 1;
  Papa.parse<string[]>(norm, {
    delimiter,
    newline: '\n',
    skipEmptyLines: false,
    step: (res, parser) => {
      const start = line;
      const end = res.meta.cursor;
      for (let i = cursor; i < end && i < norm.length; i++) if (norm.charCodeAt(i) === 10) line++;
      cursor = end;
      for (const e of res.errors) {
        problems.push({
          line: start,
          message: `line ${start}: ${e.message.replace(/\.$/, '')}; row not imported`,
        });
      }
      if (res.errors.length > 0) return;
      const cells = res.data.map((c) => String(c ?? ''));
      if (cells.every((c) => c.trim() === '')) return; // blank lines are not data
      if (!onRow({ line: start, cells })) parser.abort();
    },
  });
}

// Trailing delimiters leave empty cells at the end; they carry nothing.
const trimEnd = (cells: string[]): string[] => {
  let n = cells.length;
  while (n > 0 && cells[n - 1].trim() === '') n--;
  return cells.slice(0, n);
};

interface Layout {
  cols: Map<Col, number>;
  /** Fields a row may have: the header's, or the columns read when there is no header. */
  width: number;
  header: boolean;
  coordWidth: number;
}

/** Columns from the first row: a header, or the headerless lat,lon / id,lat,lon / position forms. */
function layoutOf(firstRow: Row, dc: boolean, problems: Problems): Layout | undefined {
  const first = trimEnd(firstRow.cells);
  const header = !first.some((c) => looksNumeric(c, dc));
  const cols = new Map<Col, number>();
  if (header) {
    const unused: string[] = [];
    first.forEach((cell, i) => {
      const c = columnOf(cell);
      if (c && !cols.has(c)) cols.set(c, i);
      else if (cell.trim() !== '') unused.push(`"${clip(cell.trim())}"`);
    });
    const hasLL = cols.has('lat') && cols.has('lon');
    const hasUTM = cols.has('easting') && cols.has('northing') && cols.has('zone');
    if (!hasLL && !hasUTM && !cols.has('mgrs') && !cols.has('position')) {
      problems.push({
        line: firstRow.line,
        message:
          `line ${firstRow.line}: header has no coordinate columns; expected lat and lon, mgrs, ` +
          'easting + northing + zone, or position; no sites imported',
      });
      return undefined;
    }
    if (unused.length) {
      problems.push({
        line: firstRow.line,
        message: `line ${firstRow.line}: column(s) ${unused.join(', ')} not recognised; their values are not imported`,
      });
    }
  } else if (looksNumeric(first[0], dc)) {
    // Headerless: lat,lon when the first cell is a number/angle; else id then lat,lon or one position cell.
    if (first.length === 1) cols.set('position', 0);
    else {
      cols.set('lat', 0);
      cols.set('lon', 1);
    }
  } else {
    cols.set('id', 0);
    if (first.length === 2) cols.set('position', 1);
    else {
      cols.set('lat', 1);
      cols.set('lon', 2);
    }
  }
  const coordWidth =
    Math.max(
      ...(['lat', 'lon', 'mgrs', 'easting', 'northing', 'zone', 'position'] as Col[]).map(
        (c) => cols.get(c) ?? -1,
      ),
    ) + 1;
  const width = header ? first.length : Math.max(...cols.values()) + 1;
  return { cols, width, header, coordWidth };
}

function readCSV(
  text: string,
  opts: ImportOptions,
  ids: IdPool,
  sink: Sink,
  problems: Problems,
): void {
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

function readRow(
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

function makeSite(
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

type Pos = { lat: number; lon: number } | { message: string };

function angle(cell: string, axis: 'lat' | 'lon', dc: boolean): number | string {
  const n = toNumber(cell, dc);
  if (n !== undefined) return n;
  const word = axis === 'lat' ? 'latitude' : 'longitude';
  const t = dc ? cell.replace(/(\d),(\d)/g, '$1.$2') : cell;
  if (/[EW]/i.test(t) && axis === 'lat')
    return `latitude "${clip(cell)}" names an east/west hemisphere`;
  if (/[NS]/i.test(t) && axis === 'lon')
    return `longitude "${clip(cell)}" names a north/south hemisphere`;
  // Pair it with a zero of the other axis so parseCoordinate reads one degrees-minutes-seconds angle.
  const r = parseCoordinate(axis === 'lat' ? `${t}, 0` : `0, ${t}`);
  if (r.ok) return axis === 'lat' ? r.lat : r.lon;
  if (/ is not in /.test(r.message.split(';')[0]))
    return `${word} "${clip(cell)}" out of range ${axis === 'lat' ? '-90…90' : '-180…180'}`;
  return `${word} "${clip(cell)}" is not a number or a degrees-minutes-seconds angle`;
}

function csvPosition(get: (c: Col) => string, cols: Map<Col, number>, dc: boolean): Pos {
  const lat = get('lat');
  const lon = get('lon');
  if (lat !== '' || lon !== '') {
    if (lat === '') return { message: 'latitude is empty' };
    if (lon === '') return { message: 'longitude is empty' };
    const a = angle(lat, 'lat', dc);
    if (typeof a === 'string') return { message: a };
    const b = angle(lon, 'lon', dc);
    if (typeof b === 'string') return { message: b };
    const err = checkLatLon(a, b, lat, lon);
    return err ? { message: err } : { lat: a, lon: b };
  }
  const m = get('mgrs');
  if (m !== '') {
    const r = parseCoordinate(m);
    if (!r.ok || !/^\d{1,2}\s*[C-HJ-NP-X]\s*[A-Z]{2}/i.test(m))
      return {
        message: `MGRS "${clip(m)}" is not valid${r.ok ? '' : ` (${r.message.split(';')[0]})`}`,
      };
    return { lat: r.lat, lon: r.lon };
  }
  const e = get('easting');
  const n = get('northing');
  const z = get('zone');
  if (e !== '' || n !== '' || (z !== '' && cols.has('easting')))
    return utmPosition(e, n, z, get('hemisphere'), get('band'), dc);
  const p = get('position');
  if (p !== '') {
    const r = parseCoordinate(dc ? p.replace(/(\d),(\d)/g, '$1.$2') : p);
    return r.ok
      ? { lat: r.lat, lon: r.lon }
      : { message: `position "${clip(p)}": ${r.message.split(';')[0]}` };
  }
  return { message: 'no coordinates' };
}

function utmPosition(
  e: string,
  n: string,
  z: string,
  hemi: string,
  band: string,
  dc: boolean,
): Pos {
  const easting = toNumber(e, dc);
  const northing = toNumber(n, dc);
  if (easting === undefined) return { message: `UTM easting "${clip(e)}" is not a number` };
  if (northing === undefined) return { message: `UTM northing "${clip(n)}" is not a number` };
  const zm = /^(\d{1,2})\s*([A-Za-z])?$/.exec(z);
  if (!zm)
    return {
      message: `UTM zone "${clip(z)}" is not a zone number 1–60 (optionally with its band letter)`,
    };
  const zone = Number(zm[1]);
  if (zone < 1 || zone > 60) return { message: `UTM zone ${zone} out of range 1…60` };
  const h = hemi.trim().toUpperCase();
  if (h !== '') {
    const hemisphere =
      h === 'N' || h === 'NORTH' ? 'N' : h === 'S' || h === 'SOUTH' ? 'S' : undefined;
    if (!hemisphere) return { message: `hemisphere "${clip(hemi)}" is not N or S` };
    if (easting < 100000 || easting > 900000)
      return { message: `UTM easting ${easting} out of range 100000…900000` };
    if (northing < 0 || northing > 10000000)
      return { message: `UTM northing ${northing} out of range 0…10000000` };
    const p = fromUTM({ zone, hemisphere, easting, northing });
    const err = checkLatLon(p.lat, p.lon);
    return err ? { message: err } : p;
  }
  const letter = (band.trim() || zm[2] || '').toUpperCase();
  if (!letter)
    return {
      message: `UTM zone "${clip(z)}" needs a latitude band letter (e.g. 32T) or a hemisphere column`,
    };
  const r = parseCoordinate(`${zone}${letter} ${easting} ${northing}`);
  return r.ok ? { lat: r.lat, lon: r.lon } : { message: r.message.split(';')[0] };
}

// ---------------------------------------------------------------- GeoJSON (and KML via togeojson)

type Json = Record<string, unknown>;
const isObj = (x: unknown): x is Json => typeof x === 'object' && x !== null && !Array.isArray(x);

function readGeoJSON(text: string, ids: IdPool, sink: Sink, problems: Problems): void {
  let root: unknown;
  try {
    root = JSON.parse(text);
  } catch (e) {
    const msg = (e as Error).message;
    const at = /position (\d+)/.exec(msg);
    const line = at ? text.slice(0, Number(at[1])).split('\n').length : undefined;
    problems.push({
      ...(line ? { line } : {}),
      message: `${line ? `line ${line}: ` : ''}not valid JSON (${msg})`,
    });
    return;
  }
  let features: unknown[];
  if (isObj(root) && root.type === 'FeatureCollection') {
    if (!Array.isArray(root.features)) {
      problems.push({ message: 'FeatureCollection has no "features" array' });
      return;
    }
    features = root.features;
  } else if (isObj(root) && root.type === 'Feature') features = [root];
  else if (isObj(root) && typeof root.type === 'string')
    features = [{ type: 'Feature', geometry: root, properties: {} }];
  else {
    problems.push({
      message: 'not GeoJSON: expected a FeatureCollection, a Feature or a geometry object',
    });
    return;
  }
  readFeatures(features, ids, sink, problems);
}

const str = (x: unknown): string | undefined =>
  typeof x === 'string' ? x : typeof x === 'number' && Number.isFinite(x) ? String(x) : undefined;

/** Sites from GeoJSON features (an array, or KML placemarks as togeojson yields them). */
function readFeatures(
  features: Iterable<unknown>,
  ids: IdPool,
  sink: Sink,
  problems: Problems,
): void {
  // Planned results in our own exports (kind release, ellipse95, …): one problem per kind.
  const results = new Map<string, { first: number[]; last: number; count: number }>();
  let i = -1;
  for (const f of features) {
    i++;
    if (!readFeature(f, i, ids, sink, problems, results)) break;
  }
  for (const [kind, at] of results) {
    const list =
      at.count > 6 ? `${at.first.slice(0, 5).join(', ')} … ${at.last}` : at.first.join(', ');
    problems.push({
      feature: at.first[0],
      message: `features ${list} (${at.count}): kind "${clip(kind)}" is a planned result, not a site; not imported`,
    });
  }
}

/** One feature; false when the plan is full and reading must stop. */
function readFeature(
  f: unknown,
  i: number,
  ids: IdPool,
  sink: Sink,
  problems: Problems,
  results: Map<string, { first: number[]; last: number; count: number }>,
): boolean {
  const where = { feature: i };
  const skip = (why: string): boolean => {
    problems.push({ feature: i, message: `features[${i}]: ${why}; not imported` });
    return true;
  };
  if (!isObj(f) || f.type !== 'Feature') return skip('not a Feature object');
  const props = isObj(f.properties) ? f.properties : {};
  const kind = str(props.kind);
  if (kind !== undefined && kind !== 'site') {
    const r = results.get(kind) ?? { first: [], last: i, count: 0 };
    if (r.first.length < 6) r.first.push(i);
    r.last = i;
    r.count++;
    results.set(kind, r);
    return true;
  }
  const points = pointsOf(f.geometry, `features[${i}]`);
  if (typeof points === 'string') return skip(points);
  const ele = optionalNumber(
    props.elevation_m ?? props.elevation ?? props.ele,
    'elevation_m',
    false,
  );
  if (!ele.ok) return skip(ele.message);
  const tol = optionalNumber(props.tolerance_m ?? props.tolerance, 'tolerance_m', false);
  if (!tol.ok) return skip(tol.message);
  const pinned = props.pinned !== false && props.pinned !== 'false';
  const variant = pinned ? str(props.variant) : undefined;
  const rawId =
    str(props.id) ??
    (typeof f.id === 'string' || typeof f.id === 'number' ? String(f.id) : undefined);
  const name = str(props.name);
  for (let k = 0; k < points.length; k++) {
    const far = sink.tooFar(points[k], 'GeoJSON and KML give longitude first');
    if (far) {
      skip(points.length > 1 ? `position ${k + 1}: ${far}` : far);
      continue;
    }
    if (!sink.accepts()) return false;
    const id = points.length > 1 && rawId !== undefined ? `${rawId}-${k + 1}` : rawId;
    sink.sites.push(makeSite(ids, where, id, name, true, points[k], ele.value, tol.value, variant));
  }
  return true;
}

function pointsOf(g: unknown, path: string): { lat: number; lon: number }[] | string {
  if (g === null || g === undefined) return 'has no geometry';
  if (!isObj(g)) return 'geometry is not an object';
  const one = (c: unknown, at: string): { lat: number; lon: number } | string => {
    if (!Array.isArray(c) || c.length < 2 || typeof c[0] !== 'number' || typeof c[1] !== 'number') {
      return `${at} is not a [lon, lat] position`;
    }
    const err = checkLatLon(c[1], c[0]);
    return err ?? { lat: c[1], lon: c[0] };
  };
  if (g.type === 'Point') {
    const p = one(g.coordinates, `${path}.geometry.coordinates`);
    return typeof p === 'string' ? p : [p];
  }
  if (g.type === 'MultiPoint') {
    if (!Array.isArray(g.coordinates) || g.coordinates.length === 0)
      return 'MultiPoint has no positions';
    const out = [];
    for (let k = 0; k < g.coordinates.length; k++) {
      const p = one(g.coordinates[k], `${path}.geometry.coordinates[${k}]`);
      if (typeof p === 'string') return p;
      out.push(p);
    }
    return out;
  }
  return `a ${typeof g.type === 'string' ? clip(g.type) : 'geometry without a type'} is not a site; only Point and MultiPoint are`;
}

// ---------------------------------------------------------------- KML

function defaultParser(onError: (line: number | undefined, msg: string) => void): XmlParser {
  const native = (globalThis as { DOMParser?: typeof DOMParser }).DOMParser;
  if (native) return (t) => new native().parseFromString(t, 'application/xml');
  return (t) => {
    const parser = new XmldomParser({
      onError: (level, msg, ctx) => {
        const loc = (ctx as { locator?: { lineNumber?: number } } | undefined)?.locator;
        onError(loc?.lineNumber, `XML ${level === 'warning' ? 'warning' : 'error'}: ${msg}`);
      },
    });
    return parser.parseFromString(t, 'text/xml') as unknown as Document;
  };
}

function readKML(
  text: string,
  opts: ImportOptions,
  ids: IdPool,
  sink: Sink,
  problems: Problems,
): void {
  const xmlProblems: ImportProblem[] = [];
  const note = (line: number | undefined, msg: string): void => {
    xmlProblems.push(line ? { line, message: `line ${line}: ${msg}` } : { message: msg });
  };
  const parse = opts.parseXml ?? defaultParser(note);
  let doc: Document;
  try {
    doc = parse(text);
  } catch (e) {
    const err = e as { message?: string; locator?: { lineNumber?: number } };
    if (xmlProblems.length === 0)
      note(err.locator?.lineNumber, `XML error: ${err.message ?? String(e)}`);
    problems.push(...xmlProblems);
    return;
  }
  problems.push(...xmlProblems);
  const perr = doc?.getElementsByTagName?.('parsererror');
  if (!doc || !doc.documentElement || (perr && perr.length > 0)) {
    const why = perr?.[0]?.textContent?.trim().split('\n')[0];
    problems.push({ message: `not well-formed XML${why ? ` (${clip(why, 160)})` : ''}` });
    return;
  }
  const root = doc.documentElement.localName ?? doc.documentElement.nodeName;
  if (root !== 'kml') {
    problems.push({ message: `root element <${root}> is not <kml>; only KML 2.2 is read` });
    return;
  }
  // Placemarks stream out of togeojson; reading stops when the plan is full.
  readFeatures(kmlGen(withoutKmlPrefix(doc) as Parameters<typeof kmlGen>[0]), ids, sink, problems);
}

/** KML 2.2 and the older Google Earth namespaces. */
const isKmlNs = (ns: string | null): boolean => ns !== null && /kml/i.test(ns);

/**
 * The document with its KML elements unprefixed (`<kml:Placemark>` → `<Placemark>`), since
 * togeojson finds elements by their qualified name. Copied without recursion (deep files).
 */
function withoutKmlPrefix(doc: Document): Document {
  const root = doc.documentElement;
  const prefixed =
    !!root.prefix ||
    doc.getElementsByTagNameNS('*', 'Placemark').length >
      doc.getElementsByTagName('Placemark').length;
  if (!prefixed) return doc;
  const out = doc.implementation.createDocument(root.namespaceURI, root.localName, null);
  const stack: [Node, Node][] = [];
  const copyAttrs = (from: Element, to: Element): void => {
    for (let a = 0; a < from.attributes.length; a++) {
      const at = from.attributes[a];
      if (!/^xmlns(:|$)/.test(at.name)) to.setAttribute(at.name, at.value);
    }
  };
  copyAttrs(root, out.documentElement);
  for (let c = root.firstChild; c; c = c.nextSibling) stack.push([c, out.documentElement]);
  stack.reverse();
  while (stack.length > 0) {
    const [node, parent] = stack.pop()!;
    if (node.nodeType === 1) {
      const el = node as Element;
      const copy = out.createElementNS(
        el.namespaceURI,
        isKmlNs(el.namespaceURI) ? el.localName : el.nodeName,
      );
      copyAttrs(el, copy);
      parent.appendChild(copy);
      const kids: [Node, Node][] = [];
      for (let c = el.firstChild; c; c = c.nextSibling) kids.push([c, copy]);
      for (let k = kids.length - 1; k >= 0; k--) stack.push(kids[k]);
    } else if (node.nodeType === 3 || node.nodeType === 4) {
      parent.appendChild(out.createTextNode(node.nodeValue ?? ''));
    }
  }
  return out;
}
