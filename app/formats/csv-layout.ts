// How a sites CSV is laid out: its delimiter, its header (column names and their aliases) or
// headerless form, and its rows.
import { parseCoordinate } from '../model';
import { delimitedRows } from './delimited';
import { clip, type Problems, toNumber } from './site-reading';
export type Col =
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

export const ALIASES: Record<string, Col> = {};
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
export function columnOf(cell: string): Col | undefined {
  const key = cell
    .toLowerCase()
    .replace(/[([].*?[)\]]/g, ' ')
    .trim()
    .replace(/[^a-z0-9]+/g, '_')
    .replace(/^_+|_+$/g, '')
    .replace(/_(m|deg|dd|degrees|metres|meters)$/, '');
  return ALIASES[key];
}

export function detectDelimiter(text: string): ',' | ';' | '\t' {
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
export function looksNumeric(cell: string, decimalComma: boolean): boolean {
  const t = cell.trim();
  if (t === '') return false;
  if (toNumber(t, decimalComma) !== undefined) return true;
  if (/\d/.test(t) && /[°'"′″]|^\d+\s+\d/.test(t)) return true;
  return parseCoordinate(t).ok;
}

export interface Row {
  line: number;
  cells: string[];
}

/** Streams the rows to `onRow` until it returns false; parsing stops there (papaparse abort). */
export function csvRows(
  text: string,
  delimiter: string,
  problems: Problems,
  onRow: (row: Row) => boolean,
): void {
  const norm = text.replace(/\r\n?/g, '\n');
  delimitedRows(norm, delimiter, 1, ({ cells, line, errors }) => {
    for (const e of errors) {
      problems.push({
        line,
        message: `line ${line}: ${e.message.replace(/\.$/, '')}; row not imported`,
      });
    }
    if (errors.length > 0) return true;
    if (cells.every((c) => c.trim() === '')) return true; // blank lines are not data
    return onRow({ line, cells });
  });
}

// Trailing delimiters leave empty cells at the end; they carry nothing.
export const trimEnd = (cells: string[]): string[] => {
  let n = cells.length;
  while (n > 0 && cells[n - 1].trim() === '') n--;
  return cells.slice(0, n);
};

export interface Layout {
  cols: Map<Col, number>;
  /** Fields a row may have: the header's, or the columns read when there is no header. */
  width: number;
  header: boolean;
  coordWidth: number;
}

/** Columns from the first row: a header, or the headerless lat,lon / id,lat,lon / position forms. */
export function layoutOf(firstRow: Row, dc: boolean, problems: Problems): Layout | undefined {
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
