/**
 * Display units: a person's preferences for lengths, speeds and coordinates, conversions
 * between SI (what the core computes in) and the chosen unit, formatting, and a strict parser
 * for numbers typed into fields. SI stays inside the core; these functions sit at the UI edge.
 */
import {
  formatDecimal,
  formatDMS,
  formatUTM,
  type LatLon,
  M_PER_FT,
  MPS_PER_KT,
  toMGRS,
} from '../model';

export type LengthUnit = 'm' | 'ft';
export type SpeedUnit = 'm/s' | 'kt' | 'km/h';
export type CoordFormat = 'decimal' | 'dms' | 'utm' | 'mgrs';

/** A person's display preferences. */
export interface UnitPrefs {
  length: LengthUnit;
  speed: SpeedUnit;
  coords: CoordFormat;
}

export const LENGTH_UNITS: readonly LengthUnit[] = ['m', 'ft'];
export const SPEED_UNITS: readonly SpeedUnit[] = ['m/s', 'kt', 'km/h'];
export const COORD_FORMATS: readonly CoordFormat[] = ['decimal', 'dms', 'utm', 'mgrs'];

export const DEFAULT_UNITS: Readonly<UnitPrefs> = Object.freeze({
  length: 'm',
  speed: 'm/s',
  coords: 'decimal',
});

/** Result of parseNumber. */
export type NumberParse = { ok: true; value: number } | { ok: false; message: string };

// Metres per second in one unit of each kind. km/h: 1000 m / 3600 s, exact.
const MPS_PER: Record<SpeedUnit, number> = { 'm/s': 1, kt: MPS_PER_KT, 'km/h': 1000 / 3600 };

const LABELS = {
  length: { m: 'm', ft: 'ft' } satisfies Record<LengthUnit, string>,
  speed: { 'm/s': 'm/s', kt: 'kt', 'km/h': 'km/h' } satisfies Record<SpeedUnit, string>,
  coords: {
    decimal: 'decimal degrees',
    dms: 'deg-min-sec',
    utm: 'UTM',
    mgrs: 'MGRS',
  } satisfies Record<CoordFormat, string>,
};

/** Metres → the display length unit. */
export function toDisplayLength(m: number, unit: LengthUnit): number {
  return unit === 'ft' ? m / M_PER_FT : m;
}

/** A value in the display length unit → metres. */
export function fromDisplayLength(value: number, unit: LengthUnit): number {
  return unit === 'ft' ? value * M_PER_FT : value;
}

/** Metres per second → the display speed unit. */
export function toDisplaySpeed(mps: number, unit: SpeedUnit): number {
  // km/h multiplies by 3.6 rather than dividing by 1/3.6 so whole m/s give exact km/h.
  return unit === 'km/h' ? mps * 3.6 : mps / MPS_PER[unit];
}

/** A value in the display speed unit → metres per second. */
export function fromDisplaySpeed(value: number, unit: SpeedUnit): number {
  return unit === 'km/h' ? value / 3.6 : value * MPS_PER[unit];
}

function formatValue(value: number, digits: number, label: string): string {
  if (!Number.isFinite(value)) return `— ${label}`;
  const text = value.toFixed(digits);
  // "-0" and "-0.0" read as a sign error; a value that rounds to zero has no sign.
  return `${/^-0(\.0*)?$/.test(text) ? text.slice(1) : text} ${label}`;
}

/** "110 m" / "361 ft": metres shown in unit with digits decimals (default 0); NaN → "— m". */
export function formatLength(m: number, unit: LengthUnit, digits = 0): string {
  return formatValue(toDisplayLength(m, unit), digits, LABELS.length[unit]);
}

/** "12.5 m/s" / "24.3 kt": m/s shown in unit with digits decimals (default 1); NaN → "— kt". */
export function formatSpeed(mps: number, unit: SpeedUnit, digits = 1): string {
  return formatValue(toDisplaySpeed(mps, unit), digits, LABELS.speed[unit]);
}

/**
 * A WGS84 position (degrees) in the chosen format. MGRS is grouped "32T MT 12345 67890" (1 m);
 * parseCoordinate reads every output back. Never throws: where UTM/MGRS are undefined (beyond
 * 80°S–84°N) it falls back to decimal degrees.
 */
export function formatCoord(p: LatLon, unit: CoordFormat): string {
  const utmDefined = p.lat >= -80 && p.lat <= 84;
  switch (unit) {
    case 'dms':
      return formatDMS(p, 1);
    case 'utm':
      if (!utmDefined) return formatDecimal(p);
      // formatUTM takes the hemisphere from the sign but the band from lat + 80, which
      // disagree for −1e-14 < lat < 0 ("31N … 10000000"); a sub-millimetre snap avoids it.
      return formatUTM(Math.abs(p.lat) < 1e-9 ? { lat: 0, lon: p.lon } : p);
    case 'mgrs': {
      if (!utmDefined) return formatDecimal(p);
      try {
        const s = toMGRS(p, 5);
        const m = /^(\d{1,2}[A-Z])([A-Z]{2})(\d{5})(\d{5})$/.exec(s);
        return m ? `${m[1]} ${m[2]} ${m[3]} ${m[4]}` : s;
      } catch {
        return formatDecimal(p);
      }
    }
    default:
      return formatDecimal(p);
  }
}

const NUMBER_RE = /^[+-]?(?:\d+\.?\d*|\.\d+)(?:e[+-]?\d+)?$/i;

/**
 * Parse a number typed into a field: optional sign, digits with '.' as the decimal point,
 * optional exponent; surrounding spaces ignored. Never throws.
 */
export function parseNumber(text: string): NumberParse {
  if (typeof text !== 'string') return { ok: false, message: 'enter a number' };
  const t = text.trim().replace(/^[−–]/, '-');
  if (t === '') return { ok: false, message: 'enter a number' };
  if (!NUMBER_RE.test(t)) {
    if (/^[+-]?[\d.,]+$/.test(t) && t.includes(',')) {
      return { ok: false, message: 'enter a number with a point as decimal separator, e.g. 12.5' };
    }
    return { ok: false, message: 'enter a number, e.g. 12.5' };
  }
  const value = Number(t);
  if (!Number.isFinite(value)) return { ok: false, message: 'number is too large' };
  return { ok: true, value };
}

/** Short label of a unit for field suffixes and column heads: "m", "kt", "MGRS". */
export function unitLabel(kind: 'length', unit: LengthUnit): string;
export function unitLabel(kind: 'speed', unit: SpeedUnit): string;
export function unitLabel(kind: 'coords', unit: CoordFormat): string;
export function unitLabel(
  kind: 'length' | 'speed' | 'coords',
  unit: LengthUnit | SpeedUnit | CoordFormat,
): string {
  return (LABELS[kind] as Record<string, string>)[unit] ?? unit;
}

/** Unit preferences from untrusted stored data; unknown or missing fields take the default. */
export function resolveUnits(stored: unknown): UnitPrefs {
  const s = (typeof stored === 'object' && stored !== null ? stored : {}) as Record<
    string,
    unknown
  >;
  const pick = <T extends string>(v: unknown, allowed: readonly T[], d: T): T =>
    allowed.includes(v as T) ? (v as T) : d;
  return {
    length: pick(s.length, LENGTH_UNITS, DEFAULT_UNITS.length),
    speed: pick(s.speed, SPEED_UNITS, DEFAULT_UNITS.speed),
    coords: pick(s.coords, COORD_FORMATS, DEFAULT_UNITS.coords),
  };
}
