// A sounding file's header: which column holds which quantity, in which unit and altitude
// reference; the delimiter; and number cells (missing-value words, decimal comma).
import { type AltitudeReference, M_PER_FT, MPS_PER_KT } from '../model';
import { ProblemList } from './import-limits';
import type { Sounding, SoundingProblem } from './sounding-csv';

export type Kind = 'altitude' | 'direction' | 'speed' | 'temperature' | 'pressure';

export interface Column {
  kind: Kind;
  index: number;
  /** Multiplier (and for temperature an offset) to SI. */
  scale: number;
  offset: number;
  unit: string;
}

// Kelvin at 0 °C (SI definition of the Celsius scale).
export const ZERO_C_K = 273.15;
// Metres per statute mile (exact, international yard).
export const M_PER_MILE = 1609.344;
// Pascal per inch of mercury at 0 °C (NIST SP 811, B.8).
export const PA_PER_INHG = 3386.389;

export const ALT_WORDS = [
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
export const DIR_WORDS = ['dir', 'direction', 'wdir', 'drct', 'wd', 'from', 'fromdeg'];
export const SPEED_WORDS = ['speed', 'spd', 'ws', 'wspd', 'sknt', 'ff', 'wind', 'velocity'];
export const TEMP_WORDS = ['t', 'temp', 'temperature', 'tmp', 'ta', 'tc', 'tk'];
export const PRES_WORDS = ['p', 'pres', 'press', 'pressure'];

export const splitWords = (cell: string): string[] =>
  cell
    .toLowerCase()
    .split(/[^a-z0-9°/]+/)
    .filter((w) => w !== '');

export function kindOf(words: string[]): Kind | null {
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
export function unitOf(
  kind: Kind,
  words: string[],
): Omit<Column, 'kind' | 'index'> | null | 'unknown' {
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

export function referenceOf(words: string[]): AltitudeReference | null {
  if (words.some((w) => w === 'agl' || w === 'hagl')) return 'AGL';
  if (words.some((w) => w === 'msl' || w === 'amsl' || w === 'asl' || w === 'hmsl')) return 'MSL';
  return null;
}

export const MISSING = new Set(['', 'na', 'n/a', 'nan', '-', '--', 'null', 'missing']);

/** A number cell: '.' decimals, or ',' when the delimiter is not a comma. undefined = empty. */
export function numberCell(
  cell: string | undefined,
  decimalComma: boolean,
): number | undefined | null {
  const t = (cell ?? '').trim().replace(/^[−–]/, '-');
  if (MISSING.has(t.toLowerCase())) return undefined;
  const s = decimalComma ? t.replace(',', '.') : t;
  if (!/^[+-]?(?:\d+\.?\d*|\.\d+)(?:e[+-]?\d+)?$/i.test(s)) return null;
  return Number(s);
}

// Pressure is not a plan field: a plausible span for the troposphere and lower stratosphere
// (about 1 hPa near 48 km, 1200 hPa above any surface; U.S. Standard Atmosphere 1976).
export const PRESSURE_PA: [number, number] = [100, 120000];

export function detectDelimiter(line: string): string {
  if (line.includes('\t')) return '\t';
  if (line.includes(';')) return ';';
  return ',';
}

/** The first line (0-based index and start offset) for which `test` holds, scanning lazily. */
export function findLine(
  body: string,
  test: (line: string) => boolean,
): { index: number; start: number } {
  let at = 0;
  for (let index = 0; at <= body.length; index++) {
    const nl = body.indexOf('\n', at);
    const end = nl < 0 ? body.length : nl;
    if (test(body.slice(at, end))) return { index, start: at };
    if (nl < 0) break;
    at = nl + 1;
  }
  return { index: -1, start: -1 };
}

export const DEFAULTS: Record<Kind, [string, number, number]> = {
  altitude: ['m', 1, 0],
  direction: ['deg', 1, 0],
  speed: ['m/s', 1, 0],
  temperature: ['°C', 1, ZERO_C_K],
  pressure: ['hPa', 100, 0],
};

/** Columns of the header row; problems about units are reported on its line. */
export function headerColumns(
  cells: string[],
  line: number,
  out: Sounding,
  problems: ProblemList<SoundingProblem>,
): Map<Kind, Column> {
  const columns = new Map<Kind, Column>();
  for (const [index, cell] of cells.entries()) {
    const words = splitWords(cell);
    const kind = kindOf(words);
    if (!kind || columns.has(kind)) continue;
    if (kind === 'altitude') out.reference = referenceOf(words);
    const unit = unitOf(kind, words);
    if (unit === 'unknown') {
      problems.push({
        line,
        message: `column "${cell.trim()}": unit not supported; column ignored`,
      });
      continue;
    }
    if (unit === null && kind === 'temperature') {
      columns.set(kind, { kind, index, scale: NaN, offset: NaN, unit: '?' });
      continue;
    }
    const [du, ds, dof] = DEFAULTS[kind];
    if (unit === null) {
      problems.push({
        line,
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
  return columns;
}

/** Imports a sounding from delimited text with a header row. Never throws. */
