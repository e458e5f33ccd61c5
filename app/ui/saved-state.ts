/**
 * What the app keeps in the browser's storage between visits (the draft plan and the settings),
 * read as hostile input: anything stored may be damaged, hand-edited or written by another
 * version. Pure functions; start-state.ts and safe-storage.ts do the reading and writing.
 */
import { COORD_FORMATS, DEFAULT_UNITS, LENGTH_UNITS, SPEED_UNITS, type UnitPrefs } from './units';

export const DRAFT_KEY = 'seedfall.draft.v1';
/** A saved draft that could not be read, kept as it was (one copy at most). */
export const DAMAGED_KEY = 'seedfall.draft.damaged.v1';
/** When that copy was made (ISO 8601). */
export const DAMAGED_TIME_KEY = 'seedfall.draft.damaged.v1.time';
export const SETTINGS_KEY = 'seedfall.settings.v1';

/**
 * Largest saved draft read, in characters. A plan at every documented list maximum (1,000 sites,
 * 200 wind layers) is well under 1 MB; more than ten times that is not a plan this app wrote.
 */
export const MAX_DRAFT_CHARS = 10_000_000;
/** Longest tile URL template kept (common practice: browsers and servers cut URLs near 2,000). */
export const MAX_TILE_URL_CHARS = 2048;
/** Longest tile attribution kept: one line of credits. */
export const MAX_ATTRIBUTION_CHARS = 500;

/** User settings kept apart from the plan. */
export interface Settings {
  units: UnitPrefs;
  /** Tile URL template for online use ('' = no tiles: grid only). */
  tileUrl: string;
  tileAttribution: string;
  /** Paper of the printed brief. */
  paper: 'A4' | 'Letter';
  /** Map layers the user switched on or off (a missing key takes the map's default). */
  mapLayers: Partial<Record<MapLayerKey, boolean>>;
}

/** The map's layer switches kept in settings (sf-map.ts). */
export const MAP_LAYER_KEYS = [
  'hazard',
  'reach',
  'landing',
  'ellipse50',
  'ellipse95',
  'window',
  'zone',
  'chosenOnly',
  'terrain',
  'basemap',
] as const;
export type MapLayerKey = (typeof MAP_LAYER_KEYS)[number];

export const DEFAULT_SETTINGS: Readonly<Settings> = Object.freeze({
  units: { ...DEFAULT_UNITS },
  tileUrl: '',
  tileAttribution: '',
  paper: 'A4',
  mapLayers: {},
});

export const PAPERS: readonly Settings['paper'][] = ['A4', 'Letter'];

/** What the stored draft text turned out to be. */
export type DraftRead =
  | { kind: 'none' }
  | { kind: 'ok'; draft: Record<string, unknown> }
  | { kind: 'damaged'; text: string; reason: string };

/** A short name for the kind of a JSON value, for messages. */
export function jsonKind(v: unknown): string {
  if (v === null) return 'null';
  if (Array.isArray(v)) return 'a list';
  if (typeof v === 'string') return 'a piece of text';
  if (typeof v === 'object') return 'an object';
  return `a ${typeof v}`;
}

/** Reads the stored draft text: a plan object, nothing, or damaged (kept with the reason). */
export function readDraftText(text: string | null): DraftRead {
  if (text === null) return { kind: 'none' };
  if (text.length > MAX_DRAFT_CHARS) {
    return {
      kind: 'damaged',
      text,
      reason: `it is ${(text.length / 1e6).toFixed(1)} million characters long, over the ${MAX_DRAFT_CHARS / 1e6} million a plan can take`,
    };
  }
  let v: unknown;
  try {
    v = JSON.parse(text);
  } catch (e) {
    return { kind: 'damaged', text, reason: `it is not JSON (${(e as Error).message})` };
  }
  if (v === null || typeof v !== 'object' || Array.isArray(v)) {
    return { kind: 'damaged', text, reason: `it holds ${jsonKind(v)}, not a plan` };
  }
  return { kind: 'ok', draft: v as Record<string, unknown> };
}

/** A short quoted preview of a stored value for a message (never the whole value). */
function shown(v: unknown): string {
  let s: string;
  try {
    s = JSON.stringify(v) ?? String(v);
  } catch {
    s = String(v);
  }
  return s.length > 40 ? `${s.slice(0, 37)}…` : s;
}

/**
 * Settings from untrusted stored data, field by field: a field that is missing takes its default
 * silently; one that is present but wrong takes its default and is named in `problems` (each a
 * phrase naming the field and what it may be).
 */
export function checkSettings(raw: unknown): { settings: Settings; problems: string[] } {
  const problems: string[] = [];
  const s =
    raw !== null && typeof raw === 'object' && !Array.isArray(raw)
      ? (raw as Record<string, unknown>)
      : {};
  if (raw !== undefined && s !== raw) {
    problems.push(`settings must be an object, not ${jsonKind(raw)}`);
  }
  const pick = <T extends string>(name: string, v: unknown, allowed: readonly T[], d: T): T => {
    if (v === undefined) return d;
    if (allowed.includes(v as T)) return v as T;
    problems.push(`${name} ${shown(v)} is not one of ${allowed.join(', ')}`);
    return d;
  };
  const text = (name: string, v: unknown, max: number): string => {
    if (v === undefined) return '';
    if (typeof v === 'string' && v.length <= max) return v;
    problems.push(
      typeof v === 'string'
        ? `${name} is ${v.length} characters, over the ${max} allowed`
        : `${name} must be text, not ${jsonKind(v)}`,
    );
    return '';
  };
  let u: Record<string, unknown> = {};
  if (s.units !== undefined) {
    if (s.units !== null && typeof s.units === 'object' && !Array.isArray(s.units)) {
      u = s.units as Record<string, unknown>;
    } else problems.push(`units must be an object, not ${jsonKind(s.units)}`);
  }
  const settings: Settings = {
    units: {
      length: pick('units.length', u.length, LENGTH_UNITS, DEFAULT_UNITS.length),
      speed: pick('units.speed', u.speed, SPEED_UNITS, DEFAULT_UNITS.speed),
      coords: pick('units.coords', u.coords, COORD_FORMATS, DEFAULT_UNITS.coords),
    },
    tileUrl: text('tileUrl', s.tileUrl, MAX_TILE_URL_CHARS),
    tileAttribution: text('tileAttribution', s.tileAttribution, MAX_ATTRIBUTION_CHARS),
    paper: pick('paper', s.paper, PAPERS, DEFAULT_SETTINGS.paper),
    mapLayers: {},
  };
  if (s.mapLayers !== undefined) {
    if (s.mapLayers !== null && typeof s.mapLayers === 'object' && !Array.isArray(s.mapLayers)) {
      // Unknown keys (another version's layers) are dropped; a known one must be true or false.
      const m = s.mapLayers as Record<string, unknown>;
      for (const k of MAP_LAYER_KEYS) {
        if (m[k] === undefined) continue;
        if (typeof m[k] === 'boolean') settings.mapLayers[k] = m[k];
        else problems.push(`mapLayers.${k} ${shown(m[k])} is not true or false`);
      }
    } else problems.push(`mapLayers must be an object, not ${jsonKind(s.mapLayers)}`);
  }
  return { settings, problems };
}

/** Reads stored settings text: never throws; damaged text gives the defaults and a problem. */
export function readSettingsText(text: string | null): { settings: Settings; problems: string[] } {
  if (text === null) return checkSettings(undefined);
  if (text.length > MAX_TILE_URL_CHARS * 4) {
    const r = checkSettings(undefined);
    r.problems.push(`settings are ${text.length} characters long, more than settings can be`);
    return r;
  }
  try {
    return checkSettings(JSON.parse(text));
  } catch (e) {
    const r = checkSettings(undefined);
    r.problems.push(`settings are not JSON (${(e as Error).message})`);
    return r;
  }
}

/** True when a storage write failed because the browser's storage is full. */
export function isQuotaError(e: unknown): boolean {
  if (typeof e !== 'object' || e === null) return false;
  const { name, code } = e as { name?: unknown; code?: unknown };
  // Chromium and WebKit name it QuotaExceededError (legacy code 22); older Firefox used
  // NS_ERROR_DOM_QUOTA_REACHED (code 1014). // from memory
  return (
    name === 'QuotaExceededError' ||
    name === 'NS_ERROR_DOM_QUOTA_REACHED' ||
    code === 22 ||
    code === 1014
  );
}
