/**
 * Import of a wind/temperature sounding from a delimited text file (CSV, semicolon or tab) by
 * papaparse. Units and the altitude reference come from the header ("altitude_ft_agl",
 * "speed (kt)", "temp °C", "p hPa"); values are converted to SI. Never throws: bad rows are
 * reported by line with the reason, good rows are kept. Winds and temperatures follow the
 * importers' one rule (import-limits.ts): a value outside the plan schema's range is left out and
 * reported with its line, field and range; rows past the plan's layer limits are not read.
 */
import { delimitedRows } from './delimited';
import type { AltitudeReference, WindLayer } from '../model';
import {
  fmt,
  MAX_IMPORT_BYTES,
  onlyFirstMessage,
  ProblemList,
  rangeProblem,
  schemaMaxItems,
} from './import-limits';
import {
  type Column,
  detectDelimiter,
  findLine,
  headerColumns,
  type Kind,
  kindOf,
  numberCell,
  PRESSURE_PA,
  splitWords,
  ZERO_C_K,
} from './sounding-columns';

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
  /** Winds and temperatures read but not handed on (out of the plan's range or over its limits). */
  notUsed: number;
  problems: SoundingProblem[];
}

export function importSounding(text: string): Sounding {
  const out: Sounding = { reference: null, layers: [], temperatures: [], notUsed: 0, problems: [] };
  const problems = new ProblemList<SoundingProblem>();
  const finish = (): Sounding => {
    out.problems = problems.items;
    const tail = problems.tail();
    if (tail) out.problems.push({ line: 0, message: tail });
    return out;
  };
  if (typeof text !== 'string') {
    problems.push({ line: 1, message: 'no text to import' });
    return finish();
  }
  if (text.length > MAX_IMPORT_BYTES) {
    problems.push({
      line: 1,
      message: `the file is larger than ${fmt(MAX_IMPORT_BYTES / 1048576)} MB, the most an import reads; nothing was read`,
    });
    return finish();
  }
  const body = text.replace(/^\uFEFF/, '').replace(/\r\n?/g, '\n');
  const head = findLine(body, (l) => {
    const ws = l.split(/[,;\t]/).map((c) => kindOf(splitWords(c)));
    return !/^\s*#/.test(l) && ws.includes('altitude') && !/^[\s\d.,;+\-\t]*$/.test(l);
  });
  if (head.index < 0) {
    problems.push({
      line: 1,
      message:
        'no header row naming an altitude column (e.g. "altitude_m,direction_deg,speed_mps,temperature_C")',
    });
    return finish();
  }
  const rest = body.slice(head.start);
  const nl = rest.indexOf('\n');
  const delimiter = detectDelimiter(nl < 0 ? rest : rest.slice(0, nl));
  const decimalComma = delimiter !== ',';
  const maxLayers = schemaMaxItems('winds.layers');
  const maxLevels = schemaMaxItems('atmosphere.sounding.levels');

  let columns: Map<Kind, Column> | undefined;
  let headerWidth = 0;
  const firstAt = new Map<number, number>();
  type Row = { z: number; wind?: WindLayer; t?: number; p?: number };
  const kept: Row[] = [];
  let winds = 0;
  let temps = 0;
  let cutWinds = 0;
  let cutTemps = 0;
  let lastWindLine = 0;
  let lastTempLine = 0;
  let stoppedAt = 0;

  const readRow = (cells: string[], line: number, error: string | undefined): boolean => {
    const cols = columns!;
    const alt = cols.get('altitude')!;
    const dir = cols.get('direction');
    const spd = cols.get('speed');
    const tmp = cols.get('temperature');
    const prs = cols.get('pressure');
    if (cells.every((c) => c.trim() === '') || /^\s*#/.test(cells[0] ?? '')) return true;
    // "100,27,0,5,5" under four columns: decimal commas split numbers into more fields.
    let width = cells.length;
    while (width > 0 && cells[width - 1].trim() === '') width--;
    if (width > headerWidth) {
      problems.push({
        line,
        message:
          `row has ${width} fields, header has ${headerWidth}` +
          (delimiter === ',' ? ' — decimal commas? use ; as separator or . as decimal point' : '') +
          '; row skipped',
      });
      return true;
    }
    const windsFull = !dir || !spd || winds >= maxLayers;
    const tempsFull = !tmp || temps >= maxLevels;
    if (windsFull && tempsFull && winds + temps > 0) {
      stoppedAt = line;
      return false;
    }
    const problem = (message: string) => problems.push({ line, message });
    if (error) {
      problem(`${error}; row skipped`);
      return true;
    }
    const raw = (col: Column) => (cells[col.index] ?? '').trim();
    const read = (col: Column | undefined): number | undefined | string => {
      if (!col) return undefined;
      const v = numberCell(cells[col.index], decimalComma);
      if (v === null) return `${col.kind} "${raw(col)}" is not a number`;
      if (v === undefined) return undefined;
      const si = v * col.scale + col.offset;
      return Number.isFinite(si) ? si : `${col.kind} "${raw(col)}" is not a finite number`;
    };
    if (tmp && tmp.unit === '?') {
      // Unitless temperatures: Kelvin when the first value reads like one, else Celsius.
      const first = numberCell(cells[tmp.index], decimalComma);
      if (typeof first === 'number') {
        Object.assign(
          tmp,
          first > 100
            ? { unit: 'K', scale: 1, offset: 0 }
            : { unit: '°C', scale: 1, offset: ZERO_C_K },
        );
        problems.push({
          line: head.index + 1,
          message: `temperature column has no unit in the header; assumed ${tmp.unit}`,
        });
      }
    }
    // Altitudes to the millimetre: no sounding is finer, and levels a few ulp apart (1e-300 m)
    // would give the hydrostatic integration a meaningless lapse rate.
    const zRaw = read(alt);
    const z = typeof zRaw === 'number' ? Math.round(zRaw * 1000) / 1000 + 0 : zRaw;
    if (typeof z !== 'number') {
      problem(`${typeof z === 'string' ? z : 'altitude is empty'}; row skipped`);
      return true;
    }
    if (out.reference === 'AGL' && z < 0) {
      problem(`altitude ${fmt(z)} m is below ground; row skipped`);
      return true;
    }
    if (firstAt.has(z)) {
      problem(`altitude ${fmt(z)} m repeats line ${firstAt.get(z)}; kept the first`);
      return true;
    }
    firstAt.set(z, line);
    const r: Row = { z };
    // The plan field's range problem, with the value as the file wrote it.
    const check = (path: string, v: number, col?: Column): string | undefined => {
      const m = rangeProblem(path, v);
      return m && col ? `${m} (${raw(col)} ${col.unit} in the file)` : m;
    };
    const d = read(dir);
    const s = read(spd);
    for (const v of [d, s]) if (typeof v === 'string') problem(`${v}; wind left out`);
    if (typeof d === 'number' && typeof s === 'number') {
      const bad =
        check('winds.layers[].altitude_m', z) ??
        check('winds.layers[].fromDeg', d, dir) ??
        check('winds.layers[].speed_mps', s, spd);
      if (bad) {
        problem(`${bad}; wind left out`);
        out.notUsed++;
      } else if (winds >= maxLayers) cutWinds++;
      else {
        r.wind = { altitude_m: z, fromDeg: d, speed_mps: s };
        winds++;
        lastWindLine = line;
      }
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
    else if (t !== undefined) {
      const bad =
        check('atmosphere.sounding.levels[].altitude_m', z) ??
        check('atmosphere.sounding.levels[].temperature_K', t, tmp);
      if (bad) {
        problem(`${bad}; temperature left out`);
        out.notUsed++;
      } else if (temps >= maxLevels) cutTemps++;
      else {
        r.t = t;
        temps++;
        lastTempLine = line;
      }
    }
    const p = read(prs);
    if (typeof p === 'string') problem(`${p}; pressure left out`);
    else if (p !== undefined) {
      if (p >= PRESSURE_PA[0] && p <= PRESSURE_PA[1]) r.p = p;
      else
        problem(
          `pressure ${raw(prs!)} ${prs!.unit} is outside ${fmt(PRESSURE_PA[0])}…${fmt(PRESSURE_PA[1])} Pa; pressure left out`,
        );
    }
    if (r.wind || r.t !== undefined || r.p !== undefined) kept.push(r);
    return true;
  };

  try {
    delimitedRows(rest, delimiter, head.index + 1, ({ cells, line: start, errors }) => {
      if (!columns) {
        columns = headerColumns(cells, start, out, problems);
        headerWidth = cells.length;
        while (headerWidth > 0 && cells[headerWidth - 1].trim() === '') headerWidth--;
        if (!columns.has('altitude')) {
          problems.push({ line: start, message: 'no altitude column in the header row' });
          return false;
        }
        if (!columns.has('direction') || !columns.has('speed')) {
          problems.push({
            line: start,
            message: `no ${!columns.has('direction') ? 'direction' : 'speed'} column; no wind layers read`,
          });
        }
        if (columns.has('pressure')) out.pressures = [];
        return true;
      }
      return readRow(cells, start, errors[0]?.message);
    });
  } catch (e) {
    problems.push({ line: head.index + 1, message: `could not read: ${(e as Error).message}` });
    return finish();
  }
  const notRead = stoppedAt ? `rows from line ${stoppedAt} on were not read` : '';
  // Rows past the plan's limits: how many were kept, and which later values were left out.
  const reportCut = (
    n: number,
    what: string,
    max: number,
    cut: number,
    field: string,
    line: number,
  ) => {
    const left = cut ? `the ${field} of ${fmt(cut)} later row(s) was left out` : '';
    problems.push({
      line,
      message: onlyFirstMessage(n, what, max, 0, [left, notRead].filter(Boolean).join('; ')),
    });
    out.notUsed += cut;
  };
  if (
    cutWinds > 0 ||
    (stoppedAt && columns?.has('direction') && columns?.has('speed') && winds >= maxLayers)
  ) {
    reportCut(winds, 'wind layers', maxLayers, cutWinds, 'wind', lastWindLine);
  }
  if (cutTemps > 0 || (stoppedAt && columns?.has('temperature') && temps >= maxLevels)) {
    reportCut(temps, 'temperatures', maxLevels, cutTemps, 'temperature', lastTempLine);
  }
  kept.sort((a, b) => a.z - b.z);
  for (const r of kept) {
    if (r.wind) out.layers.push(r.wind);
    if (r.t !== undefined) out.temperatures.push({ altitude_m: r.z, temperature_K: r.t });
    if (r.p !== undefined) out.pressures?.push({ altitude_m: r.z, pressure_Pa: r.p });
  }
  return finish();
}
