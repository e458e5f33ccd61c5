/**
 * Sites read from CSV (RFC 4180 and its everyday variants), GeoJSON (RFC 7946) or KML 2.2.
 * Every row or feature that is not imported is reported with its line or feature index and the
 * reason; good rows are kept. Never throws.
 *
 * KML needs an XML parser: `opts.parseXml` when given, else the platform's DOMParser (browser
 * main thread), else @xmldom/xmldom (Node, Web Workers).
 */
import { kml } from '@tmcw/togeojson';
import { DOMParser as XmldomParser } from '@xmldom/xmldom';
import Papa from 'papaparse';
import { fromUTM, parseCoordinate } from './coords';
import type { Site } from './plan';

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
}

type Problems = ImportProblem[];
type Where = { line?: number; feature?: number };

/** Reads sites from text: kind 'auto' picks KML for '<…', GeoJSON for '{…' or '[…', else CSV. */
export function importSites(
  text: string,
  kind: 'csv' | 'geojson' | 'kml' | 'auto',
  opts: ImportOptions = {},
): ImportResult {
  const problems: Problems = [];
  const ids = new IdPool(opts, problems);
  const sites: Site[] = [];
  try {
    const body = String(text ?? '').replace(/^\uFEFF/, '');
    const head = body.trimStart()[0];
    const k =
      kind !== 'auto'
        ? kind
        : head === '<'
          ? 'kml'
          : head === '{' || head === '['
            ? 'geojson'
            : 'csv';
    if (k === 'csv') readCSV(body, opts, ids, sites, problems);
    else if (k === 'geojson') readGeoJSON(body, ids, sites, problems);
    else readKML(body, opts, ids, sites, problems);
  } catch (e) {
    problems.push({ message: `the file could not be read: ${(e as Error)?.message ?? String(e)}` });
  }
  if (sites.length === 0 && problems.length === 0)
    problems.push({ message: 'the file holds no sites' });
  return { sites, problems };
}

// ---------------------------------------------------------------- ids and field values

// Plan schema "id": 1–64 printable characters, no leading or trailing space.
const ID_RE = /^[^\s\p{Cc}](?:[^\p{Cc}]*[^\s\p{Cc}])?$/u;

class IdPool {
  private taken = new Set<string>();
  private next = 1;
  private variants?: Set<string>;
  constructor(
    opts: ImportOptions,
    private problems: Problems,
  ) {
    for (const id of opts.existingIds ?? []) this.taken.add(id);
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
    else if (w.length > 64 || !ID_RE.test(w)) {
      id = this.fresh();
      if (!fromName)
        this.report(
          where,
          `id "${clip(w)}" is not usable (1–64 printable characters); imported as "${id}"`,
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
    if (!ID_RE.test(t) || t.length > 64) {
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

/** Optional numeric site field with the plan schema's range. */
function optionalNumber(
  raw: unknown,
  what: 'elevation' | 'tolerance',
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
  if (what === 'elevation' && (v < -500 || v > 10000))
    return { ok: false, message: `elevation ${v} m out of range -500…10000` };
  if (what === 'tolerance' && (v <= 0 || v > 10000))
    return { ok: false, message: `tolerance ${v} m out of range (0…10000]` };
  return { ok: true, value: v };
}

function checkLatLon(
  lat: number,
  lon: number,
  latText = String(lat),
  lonText = String(lon),
): string | undefined {
  if (!Number.isFinite(lat) || Math.abs(lat) > 90)
    return `latitude "${clip(latText)}" out of range -90…90`;
  if (!Number.isFinite(lon) || Math.abs(lon) > 180)
    return `longitude "${clip(lonText)}" out of range -180…180`;
  return undefined;
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
  const first = text.split('\n').find((l) => l.trim() !== '') ?? '';
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

function csvRows(text: string, delimiter: string, problems: Problems): Row[] {
  const norm = text.replace(/\r\n?/g, '\n');
  const rows: Row[] = [];
  let cursor = 0;
  let line = 1;
  Papa.parse<string[]>(norm, {
    delimiter,
    newline: '\n',
    skipEmptyLines: false,
    step: (res) => {
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
      rows.push({ line: start, cells });
    },
  });
  return rows;
}

function readCSV(
  text: string,
  opts: ImportOptions,
  ids: IdPool,
  sites: Site[],
  problems: Problems,
): void {
  const delimiter = opts.delimiter ?? detectDelimiter(text);
  const dc = delimiter !== ',';
  const rows = csvRows(text, delimiter, problems);
  if (rows.length === 0) return;
  // Trailing delimiters leave empty cells at the end; they carry nothing.
  const trimEnd = (cells: string[]): string[] => {
    let n = cells.length;
    while (n > 0 && cells[n - 1].trim() === '') n--;
    return cells.slice(0, n);
  };
  const first = trimEnd(rows[0].cells);
  const header = !first.some((c) => looksNumeric(c, dc));
  const cols = new Map<Col, number>();
  let data = rows;
  if (header) {
    data = rows.slice(1);
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
        line: rows[0].line,
        message:
          `line ${rows[0].line}: header has no coordinate columns; expected lat and lon, mgrs, ` +
          'easting + northing + zone, or position; no sites imported',
      });
      return;
    }
    if (unused.length) {
      problems.push({
        line: rows[0].line,
        message: `line ${rows[0].line}: column(s) ${unused.join(', ')} not recognised; their values are not imported`,
      });
    }
  } else {
    // Headerless: lat,lon[…] when the first cell is a number/angle; else id then lat,lon or one position cell.
    if (looksNumeric(first[0], dc)) {
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
  }
  const width = Math.max(...cols.values()) + 1;
  const coordWidth =
    Math.max(
      ...(['lat', 'lon', 'mgrs', 'easting', 'northing', 'zone', 'position'] as Col[]).map(
        (c) => cols.get(c) ?? -1,
      ),
    ) + 1;
  if (!header && rows.some((r) => trimEnd(r.cells).length > width)) {
    problems.push({
      message: `rows with more than ${width} fields: the extra fields are not imported (no header names them)`,
    });
  }
  for (const row of data) {
    const where = { line: row.line };
    const bad = (message: string): void => {
      problems.push({ line: row.line, message: `line ${row.line}: ${message}; row not imported` });
    };
    const cells = trimEnd(row.cells);
    const get = (c: Col): string => {
      const i = cols.get(c);
      return i === undefined ? '' : (cells[i] ?? '').trim();
    };
    const pos = csvPosition(get, cols, dc);
    if ('message' in pos) {
      const short = row.cells.length < coordWidth && /no coordinates|is empty/.test(pos.message);
      bad(
        short
          ? `only ${row.cells.length} field(s), the coordinates need ${coordWidth}`
          : pos.message,
      );
      continue;
    }
    const ele = optionalNumber(get('elevation'), 'elevation', dc);
    if (!ele.ok) {
      bad(ele.message);
      continue;
    }
    const tol = optionalNumber(get('tolerance'), 'tolerance', dc);
    if (!tol.ok) {
      bad(tol.message);
      continue;
    }
    const rawId = get('id') || undefined;
    const rawName = get('name') || undefined;
    sites.push(
      makeSite(ids, where, rawId, rawName, false, pos, ele.value, tol.value, get('variant')),
    );
  }
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
  if (name && name.length > 200) {
    ids.report(where, `name is longer than 200 characters; shortened`);
    name = name.slice(0, 200);
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

function readGeoJSON(text: string, ids: IdPool, sites: Site[], problems: Problems): void {
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
  readFeatures(features, ids, sites, problems);
}

const str = (x: unknown): string | undefined =>
  typeof x === 'string' ? x : typeof x === 'number' && Number.isFinite(x) ? String(x) : undefined;

function readFeatures(features: unknown[], ids: IdPool, sites: Site[], problems: Problems): void {
  // Planned results in our own exports (kind release, ellipse95, …): one problem per kind.
  const results = new Map<string, number[]>();
  features.forEach((f, i) => {
    const where = { feature: i };
    const skip = (why: string): void => {
      problems.push({ feature: i, message: `features[${i}]: ${why}; not imported` });
    };
    if (!isObj(f) || f.type !== 'Feature') return skip('not a Feature object');
    const props = isObj(f.properties) ? f.properties : {};
    const kind = str(props.kind);
    if (kind !== undefined && kind !== 'site') {
      const list = results.get(kind) ?? [];
      results.set(kind, [...list, i]);
      return;
    }
    const points = pointsOf(f.geometry, `features[${i}]`);
    if (typeof points === 'string') return skip(points);
    const ele = optionalNumber(
      props.elevation_m ?? props.elevation ?? props.ele,
      'elevation',
      false,
    );
    if (!ele.ok) return skip(ele.message);
    const tol = optionalNumber(props.tolerance_m ?? props.tolerance, 'tolerance', false);
    if (!tol.ok) return skip(tol.message);
    const pinned = props.pinned !== false && props.pinned !== 'false';
    const variant = pinned ? str(props.variant) : undefined;
    const rawId =
      str(props.id) ??
      (typeof f.id === 'string' || typeof f.id === 'number' ? String(f.id) : undefined);
    const name = str(props.name);
    points.forEach((p, k) => {
      const id = points.length > 1 && rawId !== undefined ? `${rawId}-${k + 1}` : rawId;
      sites.push(makeSite(ids, where, id, name, true, p, ele.value, tol.value, variant));
    });
  });
  for (const [kind, at] of results) {
    const list =
      at.length > 6 ? `${at.slice(0, 5).join(', ')} … ${at[at.length - 1]}` : at.join(', ');
    problems.push({
      feature: at[0],
      message: `features ${list} (${at.length}): kind "${clip(kind)}" is a planned result, not a site; not imported`,
    });
  }
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
  sites: Site[],
  problems: Problems,
): void {
  const xmlProblems: Problems = [];
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
  const fc = kml(doc as Parameters<typeof kml>[0]);
  readFeatures(fc.features, ids, sites, problems);
}
