/**
 * Import of a wind/temperature sounding from a delimited text file (CSV, semicolon or tab) by
 * papaparse. Units and the altitude reference come from the header ("altitude_ft_agl",
 * "speed (kt)", "temp °C", "p hPa"); values are converted to SI. Never throws: bad rows are
 * reported by line with the reason, good rows are kept.
 */
import Papa from 'papaparse';
import { M_PER_FT, MPS_PER_KT } from './constants';
import type { AltitudeReference, WindLayer } from './plan';

export interface SoundingProblem {
  /** 1-based line of the file. */
  line: number;
  message: string;
}

export interface Sounding {
  /** Altitude reference named in the header ("agl", "msl", "hAGL"…), else null. */
  reference: AltitudeReference | null;
  /** Wind layers, ascending altitude, SI. */
  layers: WindLayer[];
  /** Temperatures, altitude per `reference`, K, ascending. */
  temperatures: { altitude_m: number; temperature_K: number }[];
  /** Present when the file has a pressure column; Pa, ascending altitude. */
  pressures?: { altitude_m: number; pressure_Pa: number }[];
  problems: SoundingProblem[];
}

type Kind = 'altitude' | 'direction' | 'speed' | 'temperature' | 'pressure';

interface Column {
  kind: Kind;
  index: number;
  /** Multiplier (and for temperature an offset) to SI. */
  scale: number;
  offset: number;
  unit: string;
}

// Kelvin at 0 °C (SI definition of the Celsius scale).
const ZERO_C_K = 273.15;
// Metres per statute mile (exact, international yard).
const M_PER_MILE = 1609.344;
// Pascal per inch of mercury at 0 °C (NIST SP 811, B.8).
const PA_PER_INHG = 3386.389;

const ALT_WORDS = [
  'alt',
  'altitude',
  'height',
  'hgt',
  'h',
  'z',
  'hagl',
  'hmsl',
  'level',
  'agl',
  'msl',
  'amsl',
  'asl',
];
const DIR_WORDS = ['dir', 'direction', 'wdir', 'drct', 'wd', 'from', 'fromdeg'];
const SPEED_WORDS = ['speed', 'spd', 'ws', 'wspd', 'sknt', 'ff', 'wind', 'velocity'];
const TEMP_WORDS = ['t', 'temp', 'temperature', 'tmp', 'ta', 'tc', 'tk'];
const PRES_WORDS = ['p', 'pres', 'press', 'pressure'];

const splitWords = (cell: string): string[] =>
  cell
    .toLowerCase()
    .split(/[^a-z0-9°/]+/)
    .filter((w) => w !== '');

function kindOf(words: string[]): Kind | null {
  const has = (list: string[]) => words.some((w) => list.includes(w));
  // Direction before speed: "wind dir" is a direction, "wind" alone a speed; speed before
  // altitude: "speed km h" is a speed although "h" alone names a height.
  if (has(DIR_WORDS)) return 'direction';
  if (has(SPEED_WORDS)) return 'speed';
  if (has(ALT_WORDS)) return 'altitude';
  if (has(TEMP_WORDS)) return 'temperature';
  if (has(PRES_WORDS)) return 'pressure';
  return null;
}

/** Unit of a header cell for its kind; null = not stated (a default is assumed and reported). */
function unitOf(kind: Kind, words: string[]): Omit<Column, 'kind' | 'index'> | null | 'unknown' {
  const has = (...ws: string[]) => ws.some((w) => words.includes(w));
  const pair = (a: string, b: string) => {
    const i = words.indexOf(a);
    return i >= 0 && words[i + 1] === b;
  };
  const u = (unit: string, scale: number, offset = 0) => ({ unit, scale, offset });
  switch (kind) {
    case 'altitude':
      if (has('ft', 'feet', 'foot')) return u('ft', M_PER_FT);
      if (has('km')) return u('km', 1000);
      if (has('m', 'meter', 'meters', 'metre', 'metres')) return u('m', 1);
      return null;
    case 'direction':
      if (has('rad', 'radians')) return 'unknown';
      return u('deg', 1);
    case 'speed':
      if (has('kt', 'kts', 'knot', 'knots', 'kn', 'sknt')) return u('kt', MPS_PER_KT);
      if (has('km/h', 'kmh', 'kph', 'kmph') || pair('km', 'h')) return u('km/h', 1000 / 3600);
      if (has('mph')) return u('mph', M_PER_MILE / 3600);
      if (has('m/s', 'mps', 'ms') || pair('m', 's')) return u('m/s', 1);
      return null;
    case 'temperature':
      if (has('k', 'kelvin', 'tk')) return u('K', 1);
      if (has('°f', 'f', 'degf', 'fahrenheit')) return u('°F', 5 / 9, ZERO_C_K - (32 * 5) / 9);
      if (has('°c', 'c', 'degc', 'celsius', 'tc')) return u('°C', 1, ZERO_C_K);
      return null;
    case 'pressure':
      if (has('hpa', 'mb', 'mbar', 'millibar', 'millibars')) return u('hPa', 100);
      if (has('kpa')) return u('kPa', 1000);
      if (has('inhg')) return u('inHg', PA_PER_INHG);
      if (has('pa')) return u('Pa', 1);
      return null;
  }
}

function referenceOf(words: string[]): AltitudeReference | null {
  if (words.some((w) => w === 'agl' || w === 'hagl')) return 'AGL';
  if (words.some((w) => w === 'msl' || w === 'amsl' || w === 'asl' || w === 'hmsl')) return 'MSL';
  return null;
}

const MISSING = new Set(['', 'na', 'n/a', 'nan', '-', '--', 'null', 'missing']);

/** A number cell: '.' decimals, or ',' when the delimiter is not a comma. undefined = empty. */
function numberCell(cell: string | undefined, decimalComma: boolean): number | undefined | null {
  const t = (cell ?? '').trim().replace(/^[−–]/, '-');
  if (MISSING.has(t.toLowerCase())) return undefined;
  const s = decimalComma ? t.replace(',', '.') : t;
  if (!/^[+-]?(?:\d+\.?\d*|\.\d+)(?:e[+-]?\d+)?$/i.test(s)) return null;
  return Number(s);
}

const LIMITS: Record<Kind, [number, number, string]> = {
  altitude: [-500, 20000, 'm'], // what a plan's wind layers can hold
  direction: [0, 360, '°'],
  speed: [0, 150, 'm/s'],
  temperature: [150, 350, 'K'],
  pressure: [100, 120000, 'Pa'],
};

function detectDelimiter(line: string): string {
  if (line.includes('\t')) return '\t';
  if (line.includes(';')) return ';';
  return ',';
}

/** Imports a sounding from delimited text with a header row. Never throws. */
export function importSounding(text: string): Sounding {
  const out: Sounding = { reference: null, layers: [], temperatures: [], problems: [] };
  if (typeof text !== 'string') {
    out.problems.push({ line: 1, message: 'no text to import' });
    return out;
  }
  const body = text.replace(/^\uFEFF/, '').replace(/\r\n?/g, '\n');
  const lines = body.split('\n');
  const headerIdx = lines.findIndex((l) => {
    const ws = l.split(/[,;\t]/).map((c) => kindOf(splitWords(c)));
    return !/^\s*#/.test(l) && ws.includes('altitude') && !/^[\s\d.,;+\-\t]*$/.test(l);
  });
  if (headerIdx < 0) {
    out.problems.push({
      line: 1,
      message:
        'no header row naming an altitude column (e.g. "altitude_m,direction_deg,speed_mps,temperature_C")',
    });
    return out;
  }
  const delimiter = detectDelimiter(lines[headerIdx]);
  const decimalComma = delimiter !== ',';
  const lineStarts: number[] = [0];
  for (let i = 0; i < body.length; i++) if (body[i] === '\n') lineStarts.push(i + 1);
  const lineAt = (offset: number): number => {
    let lo = 0;
    let hi = lineStarts.length - 1;
    while (lo < hi) {
      const mid = (lo + hi + 1) >> 1;
      if (lineStarts[mid] <= offset) lo = mid;
      else hi = mid - 1;
    }
    return lo + 1;
  };
  const rows: { line: number; cells: string[]; error?: string }[] = [];
  const start = lineStarts[headerIdx];
  let cursor = 0;
  try {
    Papa.parse<string[]>(body.slice(start), {
      delimiter,
      newline: '\n',
      skipEmptyLines: false,
      step: (r) => {
        rows.push({ line: lineAt(start + cursor), cells: r.data, error: r.errors[0]?.message });
        cursor = r.meta.cursor;
      },
    });
  } catch (e) {
    out.problems.push({ line: headerIdx + 1, message: `could not read: ${(e as Error).message}` });
    return out;
  }
  const [header, ...data] = rows;
  const columns = new Map<Kind, Column>();
  for (const [index, cell] of header.cells.entries()) {
    const words = splitWords(cell);
    const kind = kindOf(words);
    if (!kind || columns.has(kind)) continue;
    if (kind === 'altitude') out.reference = referenceOf(words);
    const unit = unitOf(kind, words);
    if (unit === 'unknown') {
      out.problems.push({
        line: header.line,
        message: `column "${cell.trim()}": unit not supported; column ignored`,
      });
      continue;
    }
    if (unit === null && kind === 'temperature') {
      columns.set(kind, { kind, index, scale: NaN, offset: NaN, unit: '?' });
      continue;
    }
    const defaults: Record<Kind, [string, number, number]> = {
      altitude: ['m', 1, 0],
      direction: ['deg', 1, 0],
      speed: ['m/s', 1, 0],
      temperature: ['°C', 1, ZERO_C_K],
      pressure: ['hPa', 100, 0],
    };
    const [du, ds, dof] = defaults[kind];
    if (unit === null) {
      out.problems.push({
        line: header.line,
        message: `column "${cell.trim()}": no unit in the header; assumed ${du}`,
      });
    }
    columns.set(kind, {
      kind,
      index,
      scale: unit?.scale ?? ds,
      offset: unit?.offset ?? dof,
      unit: unit?.unit ?? du,
    });
  }
  const alt = columns.get('altitude');
  if (!alt) {
    out.problems.push({ line: header.line, message: 'no altitude column in the header row' });
    return out;
  }
  const dir = columns.get('direction');
  const spd = columns.get('speed');
  const tmp = columns.get('temperature');
  const prs = columns.get('pressure');
  if (!dir || !spd) {
    out.problems.push({
      line: header.line,
      message: `no ${!dir ? 'direction' : 'speed'} column; no wind layers read`,
    });
  }
  if (tmp && tmp.unit === '?') {
    // Unitless temperatures: Kelvin when the first value reads like one, else Celsius.
    const first = data
      .map((r) => numberCell(r.cells[tmp.index], decimalComma))
      .find((v): v is number => typeof v === 'number');
    const kelvin = first !== undefined && first > 100;
    Object.assign(
      tmp,
      kelvin ? { unit: 'K', scale: 1, offset: 0 } : { unit: '°C', scale: 1, offset: ZERO_C_K },
    );
    out.problems.push({
      line: header.line,
      message: `temperature column has no unit in the header; assumed ${tmp.unit}`,
    });
  }
  if (prs) out.pressures = [];

  const firstAt = new Map<number, number>();
  type Row = { z: number; wind?: WindLayer; t?: number; p?: number };
  const kept: Row[] = [];
  for (const row of data) {
    const { line, cells } = row;
    if (cells.every((c) => c.trim() === '') || /^\s*#/.test(cells[0] ?? '')) continue;
    const problem = (message: string) => out.problems.push({ line, message });
    if (row.error) {
      problem(`${row.error}; row skipped`);
      continue;
    }
    const read = (col: Column | undefined): number | undefined | string => {
      if (!col) return undefined;
      const raw = cells[col.index];
      const v = numberCell(raw, decimalComma);
      if (v === null) return `${col.kind} "${(raw ?? '').trim()}" is not a number`;
      if (v === undefined) return undefined;
      const si = v * col.scale + col.offset;
      const [lo, hi, u] = LIMITS[col.kind];
      if (!(si >= lo && si <= hi)) {
        return `${col.kind} ${(raw ?? '').trim()} ${col.unit} is outside ${lo}…${hi} ${u}`;
      }
      return si;
    };
    const z = read(alt);
    if (typeof z !== 'number') {
      problem(`${typeof z === 'string' ? z : 'altitude is empty'}; row skipped`);
      continue;
    }
    if (out.reference === 'AGL' && z < 0) {
      problem(`altitude ${z} m is below ground; row skipped`);
      continue;
    }
    if (firstAt.has(z)) {
      problem(`altitude ${z} m repeats line ${firstAt.get(z)}; kept the first`);
      continue;
    }
    firstAt.set(z, line);
    const r: Row = { z };
    const d = read(dir);
    const s = read(spd);
    for (const v of [d, s]) if (typeof v === 'string') problem(`${v}; wind left out`);
    if (typeof d === 'number' && typeof s === 'number') {
      r.wind = { altitude_m: z, fromDeg: d, speed_mps: s };
    } else if (
      dir &&
      spd &&
      typeof d !== 'string' &&
      typeof s !== 'string' &&
      (d ?? s) !== undefined
    ) {
      problem(`${d === undefined ? 'direction' : 'speed'} is empty; wind left out`);
    }
    const t = read(tmp);
    if (typeof t === 'string') problem(`${t}; temperature left out`);
    else if (t !== undefined) r.t = t;
    const p = read(prs);
    if (typeof p === 'string') problem(`${p}; pressure left out`);
    else if (p !== undefined) r.p = p;
    kept.push(r);
  }
  kept.sort((a, b) => a.z - b.z);
  for (const r of kept) {
    if (r.wind) out.layers.push(r.wind);
    if (r.t !== undefined) out.temperatures.push({ altitude_m: r.z, temperature_K: r.t });
    if (r.p !== undefined) out.pressures?.push({ altitude_m: r.z, pressure_Pa: r.p });
  }
  return out;
}
