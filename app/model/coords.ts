/**
 * Coordinate formats at the UI and brief edge: decimal degrees, degrees-minutes-seconds, UTM
 * (via proj4) and MGRS (via the `mgrs` package), and a parser that accepts any of them.
 *
 * UTM here is zone + latitude band letter ("32T 512345 5228765"), the form MGRS also uses;
 * the band letter, not a hemisphere letter, follows the zone. UTM is defined 80°S–84°N;
 * polar (UPS) coordinates are not handled.
 */
import proj4 from 'proj4';
import * as mgrsModule from 'mgrs';
import type { LatLon } from './geodesy';

type MgrsApi = typeof mgrsModule;
// Node's ESM loader gets mgrs's UMD build (CommonJS: a default export only); bundlers take its
// ESM build (named exports only). Accept either shape.
// (Reflect.get keeps the bundler from warning about a `default` the ESM build lacks.)
const mgrs: MgrsApi =
  'forward' in mgrsModule ? mgrsModule : (Reflect.get(mgrsModule, 'default') as MgrsApi);

/** A UTM coordinate on WGS84. */
export interface UTM {
  zone: number;
  hemisphere: 'N' | 'S';
  easting: number;
  northing: number;
}

/** Result of parseCoordinate. */
export type ParseResult = { ok: true; lat: number; lon: number } | { ok: false; message: string };

// Latitude bands C–X (no I or O), 8° each from 80°S; X spans 72°N–84°N.
const BANDS = 'CDEFGHJKLMNPQRSTUVWX';

/** "lat, lon" in decimal degrees with the given number of decimals. */
export function formatDecimal(p: LatLon, digits = 6): string {
  return `${p.lat.toFixed(digits)}, ${p.lon.toFixed(digits)}`;
}

function dmsPart(value: number, pos: string, neg: string, secDigits: number): string {
  const scale = 10 ** secDigits;
  // Round once, in units of the last printed digit, so 59.95″ carries into the minute.
  const total = Math.round(Math.abs(value) * 3600 * scale);
  const deg = Math.floor(total / (3600 * scale));
  const min = Math.floor((total - deg * 3600 * scale) / (60 * scale));
  const sec = (total - deg * 3600 * scale - min * 60 * scale) / scale;
  const secText = sec.toFixed(secDigits).padStart(secDigits > 0 ? secDigits + 3 : 2, '0');
  const hemi = value < 0 && total > 0 ? neg : pos;
  return `${deg}°${String(min).padStart(2, '0')}′${secText}″${hemi}`;
}

/** Degrees-minutes-seconds, e.g. `47°12′34.5″N 8°03′21.0″E`; secDigits decimals on the seconds. */
export function formatDMS(p: LatLon, secDigits = 1): string {
  return `${dmsPart(p.lat, 'N', 'S', secDigits)} ${dmsPart(p.lon, 'E', 'W', secDigits)}`;
}

/** UTM latitude band letter for a latitude in degrees (C…X), or undefined outside 80°S–84°N. */
export function utmBand(lat: number): string | undefined {
  if (!(lat >= -80 && lat <= 84)) return undefined;
  return BANDS[Math.min(Math.floor((lat + 80) / 8), BANDS.length - 1)];
}

/** Standard UTM zone for a WGS84 point, with the Norway (32V) and Svalbard (31X–37X) exceptions. */
export function utmZone(p: LatLon): number {
  // 180° stays 180° (zone 60, as the mgrs package does); only out-of-range values wrap.
  const lon = p.lon >= -180 && p.lon <= 180 ? p.lon : ((((p.lon + 180) % 360) + 360) % 360) - 180;
  let zone = Math.min(Math.floor((lon + 180) / 6) + 1, 60);
  if (p.lat >= 56 && p.lat < 64 && lon >= 3 && lon < 12) zone = 32;
  if (p.lat >= 72 && p.lat < 84 && lon >= 0 && lon < 42) {
    zone = lon < 9 ? 31 : lon < 21 ? 33 : lon < 33 ? 35 : 37;
  }
  return zone;
}

const utmConverters = new Map<string, proj4.Converter>();
function utmConverter(zone: number, hemisphere: 'N' | 'S'): proj4.Converter {
  const key = `${zone}${hemisphere}`;
  let c = utmConverters.get(key);
  if (!c) {
    const south = hemisphere === 'S' ? ' +south' : '';
    c = proj4(
      'WGS84',
      `+proj=utm +zone=${zone}${south} +ellps=WGS84 +datum=WGS84 +units=m +no_defs`,
    );
    utmConverters.set(key, c);
  }
  return c;
}

/** WGS84 degrees → UTM metres, in the point's standard zone unless zone is given. */
export function toUTM(p: LatLon, zone = utmZone(p)): UTM {
  const hemisphere = p.lat < 0 ? 'S' : 'N';
  const r = utmConverter(zone, hemisphere).forward({ x: p.lon, y: p.lat });
  return { zone, hemisphere, easting: r.x, northing: r.y };
}

/** UTM metres → WGS84 degrees. */
export function fromUTM(u: UTM): LatLon {
  const r = utmConverter(u.zone, u.hemisphere).inverse({ x: u.easting, y: u.northing });
  return { lat: r.y, lon: ((((r.x + 180) % 360) + 360) % 360) - 180 };
}

/** "32T 512345 5228765": zone, band letter, easting and northing rounded to whole metres. */
export function formatUTM(p: LatLon): string {
  const u = toUTM(p);
  const band = utmBand(p.lat) ?? '?';
  return `${u.zone}${band} ${Math.round(u.easting)} ${Math.round(u.northing)}`;
}

/** MGRS string for a WGS84 point; precision 5 = 1 m … 0 = 100 km. Throws outside 80°S–84°N. */
export function toMGRS(p: LatLon, precision = 5): string {
  return mgrs.forward([p.lon, p.lat], precision);
}

/** Centre of the MGRS square as WGS84 degrees. Throws on a malformed string. */
export function fromMGRS(s: string): LatLon {
  const [lon, lat] = mgrs.toPoint(s.replace(/\s+/g, '').toUpperCase());
  return { lat, lon };
}

const EXPECTED =
  'expected decimal degrees "47.2, 8.05", degrees-minutes-seconds "47°12′34.5″N 8°03′21.0″E", ' +
  'UTM "32T 512345 5228765" or MGRS "32TMT1234567890"';

const fail = (why: string): ParseResult => ({ ok: false, message: `${why}; ${EXPECTED}` });

const UTM_RE =
  /^(\d{1,2})\s*([C-HJ-NP-X])\s*[\s,]\s*(\d+(?:\.\d+)?)\s*(?:M?E)?\s*[\s,]\s*(\d+(?:\.\d+)?)\s*(?:M?N)?$/;
const MGRS_RE = /^(\d{1,2})([C-HJ-NP-X])([A-HJ-NP-Z][A-HJ-NP-V])(\d*)$/;

function parseUTM(m: RegExpMatchArray): ParseResult {
  const zone = Number(m[1]);
  const band = m[2];
  const easting = Number(m[3]);
  const northing = Number(m[4]);
  if (zone < 1 || zone > 60) return fail(`UTM zone ${zone} is not in 1–60`);
  if (easting < 100000 || easting > 900000)
    return fail(`UTM easting ${m[3]} is not in 100000–900000 m`);
  if (northing < 0 || northing > 10000000)
    return fail(`UTM northing ${m[4]} is not in 0–10000000 m`);
  const hemisphere = band >= 'N' ? 'N' : 'S';
  const p = fromUTM({ zone, hemisphere, easting, northing });
  const lo = -80 + 8 * BANDS.indexOf(band);
  const hi = band === 'X' ? 84 : lo + 8;
  // A coordinate rounded to the metre may sit a hair across its band's edge.
  if (!(p.lat >= lo - 0.01 && p.lat <= hi + 0.01)) {
    return fail(
      `UTM band ${band} covers ${lo}° to ${hi}° latitude but northing ${m[4]} gives ` +
        `${p.lat.toFixed(2)}° (the letter after the zone is the latitude band, not N/S)`,
    );
  }
  return { ok: true, lat: p.lat, lon: p.lon };
}

function parseMGRS(m: RegExpMatchArray, compact: string): ParseResult {
  if (m[4].length % 2 !== 0 || m[4].length > 10) {
    return fail('MGRS needs an even number of digits (0–10) after the square letters');
  }
  const zone = Number(m[1]);
  if (zone < 1 || zone > 60) return fail(`MGRS zone ${zone} is not in 1–60`);
  const p = fromMGRS(compact);
  if (!Number.isFinite(p.lat) || !Number.isFinite(p.lon))
    return fail(`MGRS "${compact}" is not valid`);
  return { ok: true, lat: p.lat, lon: p.lon };
}

// One angle: optional hemisphere letter before or after; degrees, optional minutes and seconds.
// Minutes need a ° or a space before them, seconds a ′ or a space, so "4712.5" is never split.
const ANGLE_RE =
  /^([NSEW])?\s*([+-]?\d+(?:\.\d+)?)(?:\s*°)?(?:(?:(?<=°)\s*|\s+)(\d+(?:\.\d+)?)(?:\s*')?(?:(?:(?<=')\s*|\s+)(\d+(?:\.\d+)?)(?:\s*")?)?)?\s*([NSEW])?$/;

interface Angle {
  value: number;
  axis?: 'lat' | 'lon';
}

function parseAngle(text: string): Angle | string {
  const m = ANGLE_RE.exec(text.trim());
  if (!m) return `"${text.trim()}" is not an angle`;
  const [, pre, d, mi, se, post] = m;
  if (pre && post) return `"${text.trim()}" has two hemisphere letters`;
  const hemi = pre ?? post;
  if (hemi && /^[+-]/.test(d)) return `"${text.trim()}" has both a sign and a hemisphere letter`;
  if ((mi !== undefined && d.includes('.')) || (se !== undefined && mi.includes('.'))) {
    return `"${text.trim()}": only the last of degrees, minutes, seconds may have decimals`;
  }
  const min = mi === undefined ? 0 : Number(mi);
  const sec = se === undefined ? 0 : Number(se);
  if (min >= 60 || sec >= 60) return `"${text.trim()}": minutes and seconds must be below 60`;
  const deg = Math.abs(Number(d));
  let value = deg + min / 60 + sec / 3600;
  if (d.startsWith('-') || hemi === 'S' || hemi === 'W') value = -value;
  const axis = hemi === undefined ? undefined : hemi === 'N' || hemi === 'S' ? 'lat' : 'lon';
  return { value, axis };
}

function splitPair(t: string): [string, string] | undefined {
  const seps = t.split(/[,;]/);
  if (seps.length === 2) return [seps[0], seps[1]];
  if (seps.length > 2) return undefined;
  const letters = [...t.matchAll(/[NSEW]/g)];
  if (letters.length === 2) {
    const first = letters[0].index ?? 0;
    const cut = t.slice(0, first).trim() === '' ? (letters[1].index ?? 0) : first + 1;
    return [t.slice(0, cut), t.slice(cut)];
  }
  const tokens = t.split(/\s+/);
  if (tokens.length === 2 || tokens.length === 4 || tokens.length === 6) {
    const h = tokens.length / 2;
    return [tokens.slice(0, h).join(' '), tokens.slice(h).join(' ')];
  }
  return undefined;
}

function parseLatLon(t: string): ParseResult {
  const pair = splitPair(t);
  if (!pair) return fail('could not split the text into a latitude and a longitude');
  const a = parseAngle(pair[0]);
  if (typeof a === 'string') return fail(a);
  const b = parseAngle(pair[1]);
  if (typeof b === 'string') return fail(b);
  if (a.axis !== undefined && a.axis === b.axis) return fail('both values name the same axis');
  const swap = a.axis === 'lon' || b.axis === 'lat';
  const lat = swap ? b.value : a.value;
  const lon = swap ? a.value : b.value;
  if (Math.abs(lat) > 90) return fail(`latitude ${lat} is not in −90…90`);
  if (Math.abs(lon) > 180) return fail(`longitude ${lon} is not in −180…180`);
  return { ok: true, lat, lon };
}

/** Parse a position typed or pasted by a person; never throws. Unlabelled pairs are lat, lon. */
export function parseCoordinate(text: string): ParseResult {
  try {
    if (typeof text !== 'string') return fail('no text');
    const t = text
      .replace(/[º˚]/g, '°')
      .replace(/[′’‘`´]/g, "'")
      .replace(/[″”“]|''/g, '"')
      .toUpperCase()
      .replace(/[−–]/g, '-')
      .trim();
    if (t === '') return fail('empty text');
    const utm = UTM_RE.exec(t);
    if (utm) return parseUTM(utm);
    const compact = t.replace(/\s+/g, '');
    const mgrs = MGRS_RE.exec(compact);
    if (mgrs) return parseMGRS(mgrs, compact);
    return parseLatLon(t);
  } catch (e) {
    return fail(`could not read "${String(text).slice(0, 60)}" (${(e as Error).message})`);
  }
}
