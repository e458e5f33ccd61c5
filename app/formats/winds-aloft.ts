/**
 * Decoder of the US National Weather Service winds-aloft text forecast ("FB"), an open format:
 * a header line listing levels in feet MSL ("FT  3000    6000 …") and one line per station with
 * a DDff±TT group under each level (docs/model.md §13). Never throws: what cannot be read is
 * reported in `problems` with its line and reason, and everything else is kept.
 */
import { type AltitudeReference, M_PER_FT, MPS_PER_KT, type WindLayer } from '../model';
import {
  fmt,
  MAX_IMPORT_BYTES,
  onlyFirstMessage,
  rangeProblem,
  schemaMaxItems,
} from './import-limits';

/** One decoded level of a station. */
export interface WindsAloftLayer {
  /** Level, m MSL (altitude_ft × 0.3048 exactly). */
  altitude_m: number;
  /** Level as printed in the header, ft MSL. */
  altitude_ft: number;
  /** Direction the wind blows from, degrees true; null = light and variable ("9900"). */
  fromDeg: number | null;
  /** Knots × 1852/3600 exactly; 0 for light and variable (the product only says < 5 kt). */
  speed_mps: number;
  /** °C; null where the group carries none (3000 ft, or an unreadable temperature). */
  temperature_C: number | null;
  /** True when the group is coded 199 kt, which stands for 199 kt or more. */
  capped?: true;
}

export interface WindsAloftStation {
  id: string;
  /** 1-based line of the station in the bulletin. */
  line: number;
  /** Levels that carry a wind group, ascending; missing groups (near station elevation) are absent. */
  layers: WindsAloftLayer[];
  /** This station's problems (also listed in the bulletin's `problems`). */
  problems: string[];
}

export interface WindsAloft {
  /** Levels of the header line(s), ft MSL, ascending. */
  levels_ft: number[];
  stations: WindsAloftStation[];
  /** Every problem found, station ones included: "line 7: QXV 9000 ft group "27X5-04": …". */
  problems: string[];
}

// Kelvin at 0 °C (SI definition of the Celsius scale).
const ZERO_C_K = 273.15;

/** FB convention: above 24000 ft temperatures are printed without a sign and are negative. */
const SIGNLESS_ABOVE_FT = 24000;

interface Token {
  text: string;
  start: number;
  /** Column after the last character (groups are right-aligned under their level label). */
  end: number;
}

function tokens(line: string): Token[] {
  const out: Token[] = [];
  const re = /\S+/g;
  let m: RegExpExecArray | null;
  while ((m = re.exec(line)) !== null) {
    out.push({ text: m[0], start: m.index, end: m.index + m[0].length });
  }
  return out;
}

/** Tabs to 8-column stops, so positions keep their meaning. */
function expandTabs(line: string): string {
  if (!line.includes('\t')) return line;
  let out = '';
  for (const ch of line) {
    if (ch === '\t') out += ' '.repeat(8 - (out.length % 8));
    else out += ch;
  }
  return out;
}

/** Header levels with the end column of each label, or null when the line is not a header. */
function parseHeader(toks: Token[]): { ft: number; end: number }[] | null {
  if (toks.length < 2 || toks[0].text.toUpperCase() !== 'FT') return null;
  const levels: { ft: number; end: number }[] = [];
  for (const t of toks.slice(1)) {
    if (!/^\d{3,5}$/.test(t.text)) return null;
    const ft = Number(t.text);
    if (levels.length > 0 && ft <= levels[levels.length - 1].ft) return null;
    levels.push({ ft, end: t.end });
  }
  return levels;
}

type GroupResult = { ok: true; layer: WindsAloftLayer } | { ok: false; reason: string };

/** Decodes one DDff(±TT) group at level ft (feet MSL). */
export function decodeGroup(group: string, ft: number): GroupResult {
  const m = /^(\d{2})(\d{2})(?:([+-]?)(\d{2}))?$/.exec(group);
  if (!m) {
    return {
      ok: false,
      reason: 'expected DDff, DDff±TT or DDffTT (DD direction in tens of degrees, ff knots)',
    };
  }
  const dd = Number(m[1]);
  const ff = Number(m[2]);
  let temperature_C: number | null = null;
  if (m[4] !== undefined) {
    const tt = Number(m[4]);
    if (m[3] === '+') temperature_C = tt;
    else if (m[3] === '-') temperature_C = -tt;
    else if (ft > SIGNLESS_ABOVE_FT) temperature_C = -tt;
    else return { ok: false, reason: `temperature without a sign at or below 24000 ft` };
  }
  const altitude_m = ft * M_PER_FT;
  if (dd === 99) {
    if (ff !== 0)
      return { ok: false, reason: 'direction 99 is only used as 9900 (light and variable)' };
    return {
      ok: true,
      layer: { altitude_m, altitude_ft: ft, fromDeg: null, speed_mps: 0, temperature_C },
    };
  }
  let dirTens: number;
  let kt: number;
  if (dd <= 36) {
    dirTens = dd;
    kt = ff;
  } else if (dd >= 51 && dd <= 86) {
    // 100–199 kt: 50 is added to the direction and 100 taken from the speed (7704 → 270° 104 kt).
    dirTens = dd - 50;
    kt = ff + 100;
  } else {
    return { ok: false, reason: `direction code ${m[1]} is neither 00–36, 51–86 nor 99` };
  }
  const layer: WindsAloftLayer = {
    altitude_m,
    altitude_ft: ft,
    fromDeg: dirTens * 10,
    speed_mps: kt * MPS_PER_KT,
    temperature_C,
  };
  if (kt === 199) layer.capped = true;
  return { ok: true, layer };
}

/** Which level each group belongs to: by column when aligned, else missing groups at the bottom. */
function assignGroups(
  groups: Token[],
  levels: { ft: number; end: number }[],
): { index: number[]; aligned: boolean } {
  const index: number[] = [];
  let aligned = true;
  for (const g of groups) {
    let best = -1;
    let bestD = Infinity;
    levels.forEach((l, i) => {
      const d = Math.abs(l.end - g.end);
      if (d < bestD) {
        bestD = d;
        best = i;
      }
    });
    if (bestD > 1 || (index.length > 0 && best <= index[index.length - 1])) aligned = false;
    index.push(best);
  }
  if (aligned) return { index, aligned };
  // Spacing lost (e.g. pasted text): groups missing near station elevation are the lowest ones.
  const skip = Math.max(0, levels.length - groups.length);
  return { index: groups.map((_, i) => i + skip), aligned: false };
}

/** Decodes a winds-aloft bulletin (text with a "FT 3000 6000 …" header). Never throws. */
export function decodeWindsAloft(text: string): WindsAloft {
  const result: WindsAloft = { levels_ft: [], stations: [], problems: [] };
  if (typeof text !== 'string') {
    result.problems.push('line 1: no text to decode');
    return result;
  }
  if (text.length > MAX_IMPORT_BYTES) {
    result.problems.push(
      `the text is longer than ${fmt(MAX_IMPORT_BYTES / 1048576)} MB, the most an import reads; nothing decoded`,
    );
    return result;
  }
  const lines = text.replace(/^\uFEFF/, '').split(/\r\n|\r|\n/);
  const seen = new Map<string, number>();
  const allLevels = new Set<number>();
  let levels: { ft: number; end: number }[] | null = null;

  lines.forEach((raw, li) => {
    const lineNo = li + 1;
    const line = expandTabs(raw);
    const toks = tokens(line);
    if (toks.length === 0) return;
    const header = parseHeader(toks);
    if (header) {
      levels = header;
      for (const l of header) allLevels.add(l.ft);
      return;
    }
    if (!levels) return; // Preamble (product name, valid time) before the header.
    const id = toks[0].text.toUpperCase();
    const rest = toks.slice(1);
    const groupish = (t: Token) => /^\d{4}(?:[+-]?\d{2})?$/.test(t.text);
    if (!/^[A-Z0-9]{3,4}$/.test(id) || !/[A-Z]/.test(id) || !rest.some(groupish)) {
      // Remarks ("TEMPS NEG ABV 24000") are skipped; group-like text without a station id is not.
      if (toks.filter(groupish).length >= 2) {
        result.problems.push(
          `line ${lineNo}: not a station line (expected a 3–4 character station id, then groups)`,
        );
      }
      return;
    }
    const station: WindsAloftStation = { id, line: lineNo, layers: [], problems: [] };
    const report = (msg: string) => {
      station.problems.push(`line ${lineNo}: ${msg}`);
      result.problems.push(`line ${lineNo}: ${msg}`);
    };
    if (seen.has(id)) {
      result.problems.push(
        `line ${lineNo}: station ${id} appears again (first on line ${seen.get(id)}); kept the first`,
      );
      return;
    }
    seen.set(id, lineNo);
    const lv: { ft: number; end: number }[] = levels;
    let groups = rest;
    if (groups.length > lv.length) {
      report(`${id}: ${groups.length} groups for ${lv.length} levels; extra groups ignored`);
      groups = groups.slice(0, lv.length);
    }
    const { index, aligned } = assignGroups(groups, lv);
    if (!aligned && groups.length < lv.length) {
      report(
        `${id}: groups are not aligned under the level header; took the missing ones to be the lowest levels`,
      );
    }
    groups.forEach((g, gi) => {
      const ft = lv[index[gi]].ft;
      const r = decodeGroup(g.text, ft);
      if (r.ok) station.layers.push(r.layer);
      else report(`${id} ${ft} ft group "${g.text}": ${r.reason}`);
    });
    result.stations.push(station);
  });

  if (!levels) {
    result.problems.push(
      'line 1: no level header found (a line like "FT  3000    6000    9000 …"); nothing decoded',
    );
  }
  result.levels_ft = [...allLevels].sort((a, b) => a - b);
  return result;
}

export interface StationLayersOptions {
  /** Plan ground elevation, m MSL; levels at or below it are left out. Default 0. */
  groundElevation_m?: number;
  /** Reference of the returned altitudes (AGL subtracts groundElevation_m). Default 'MSL'. */
  reference?: AltitudeReference;
}

export interface StationLayers {
  reference: AltitudeReference;
  /** Wind layers for a plan's `winds.layers`, altitudes per `reference`, ascending. */
  layers: WindLayer[];
  /** Forecast temperatures, altitude_m per `reference`, for a SoundingAtmosphere. */
  temperatures: { altitude_m: number; temperature_K: number }[];
  /** Decoded winds and temperatures above the ground not handed on (out of range or over a limit). */
  notUsed: number;
  problems: string[];
}

/**
 * One station's levels as plan wind layers. Light and variable becomes speed 0 with the direction
 * of the nearest level that has one (0 if none): with no speed the direction never moves a body,
 * and carrying it keeps tables and interpolated displays steady. A wind or temperature outside
 * the plan schema's range is not handed on and is reported with its line, field and range; levels
 * over the plan's layer limit are cut with "only the first N … were read". Never throws.
 */
export function stationLayers(
  decoded: WindsAloft,
  id: string,
  opts: StationLayersOptions = {},
): StationLayers {
  const reference = opts.reference ?? 'MSL';
  const ground = opts.groundElevation_m ?? 0;
  const out: StationLayers = {
    reference,
    layers: [],
    temperatures: [],
    notUsed: 0,
    problems: [],
  };
  const want = String(id).trim().toUpperCase();
  const station = decoded?.stations?.find((s) => s.id === want);
  if (!station) {
    out.problems.push(`station ${want} is not in the bulletin`);
    return out;
  }
  const at = `line ${station.line}: ${want}`;
  const offset = reference === 'AGL' ? ground : 0;
  const above = station.layers.filter((l) => l.altitude_m > ground);
  const below = station.layers.length - above.length;
  if (below > 0) {
    out.problems.push(
      `${at}: ${below} level(s) at or below the ground elevation ${ground} m left out`,
    );
  }
  const maxLayers = schemaMaxItems('winds.layers');
  const maxLevels = schemaMaxItems('atmosphere.sounding.levels');
  let cutLayers = 0;
  let cutLevels = 0;
  const directed = above.filter((l) => l.fromDeg !== null);
  for (const l of above) {
    const z = l.altitude_m - offset;
    const lv = `${at} ${l.altitude_ft} ft`;
    let fromDeg = l.fromDeg;
    if (fromDeg === null) {
      let best: WindsAloftLayer | null = null;
      for (const d of directed) {
        if (
          !best ||
          Math.abs(d.altitude_m - l.altitude_m) < Math.abs(best.altitude_m - l.altitude_m)
        )
          best = d;
      }
      fromDeg = best?.fromDeg ?? 0;
    }
    const windBad =
      rangeProblem('winds.layers[].altitude_m', z) ??
      rangeProblem('winds.layers[].speed_mps', l.speed_mps) ??
      rangeProblem('winds.layers[].fromDeg', fromDeg);
    if (windBad) {
      const capped = l.capped ? '; 199 kt is coded for 199 kt or more' : '';
      out.problems.push(`${lv}: ${windBad}${capped}; wind not used`);
      out.notUsed++;
    } else if (out.layers.length >= maxLayers) {
      cutLayers++;
    } else {
      out.layers.push({ altitude_m: z, fromDeg, speed_mps: l.speed_mps });
      if (l.capped) out.problems.push(`${lv}: 199 kt is coded for 199 kt or more`);
    }
    if (l.temperature_C !== null) {
      const K = l.temperature_C + ZERO_C_K;
      const tBad =
        rangeProblem('atmosphere.sounding.levels[].altitude_m', z) ??
        rangeProblem('atmosphere.sounding.levels[].temperature_K', K);
      if (tBad) {
        out.problems.push(`${lv}: ${tBad} (${fmt(l.temperature_C)} °C); temperature not used`);
        out.notUsed++;
      } else if (out.temperatures.length >= maxLevels) {
        cutLevels++;
      } else {
        out.temperatures.push({ altitude_m: z, temperature_K: K });
      }
    }
  }
  const rest = (n: number) => `${fmt(n)} higher level(s) not used`;
  if (cutLayers > 0) {
    out.problems.push(
      `${at}: ${onlyFirstMessage(out.layers.length, 'wind layers', maxLayers, 0, rest(cutLayers))}`,
    );
    out.notUsed += cutLayers;
  }
  if (cutLevels > 0) {
    out.problems.push(
      `${at}: ${onlyFirstMessage(out.temperatures.length, 'temperatures', maxLevels, 0, rest(cutLevels))}`,
    );
    out.notUsed += cutLevels;
  }
  return out;
}
