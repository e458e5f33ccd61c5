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

/**
 * What a number measures. Each quantity has one display rounding per unit (DECIMALS), used by
 * read-only text and by number fields alike.
 */
export type Quantity =
  | 'distance' // horizontal lengths: CEP, tolerance, radii, buffers, position error
  | 'height' // altitudes, elevations, heights above ground
  | 'speed' // wind, ground, descent and vertical air speeds
  | 'time'
  | 'angle' // glide angles, heading errors
  | 'bearing' // tracks and wind directions, ° true
  | 'coordinate' // latitude, longitude in degrees
  | 'mass'
  | 'energy'
  | 'percent'
  | 'probability' // 0 … 1
  | 'temperature' // a temperature difference
  | 'ratio' // dimensionless: exponents
  | 'count' // samples, seeds
  | 'cost'; // any unit the team likes

/** The units each quantity can be shown in (the first is the one the plan stores). */
const QUANTITY_UNITS = {
  distance: ['m', 'ft'],
  height: ['m', 'ft'],
  speed: ['m/s', 'kt', 'km/h'],
  time: ['s'],
  angle: ['°'],
  bearing: ['°'],
  coordinate: ['°'],
  mass: ['kg'],
  energy: ['J'],
  percent: ['%'],
  probability: [''],
  temperature: ['K'],
  ratio: [''],
  count: [''],
  cost: [''],
} as const satisfies Record<Quantity, readonly string[]>;

/** A unit a quantity can be shown in. */
export type QuantityUnit<Q extends Quantity> = (typeof QUANTITY_UNITS)[Q][number];

/**
 * Decimals shown for each quantity in each unit: the one rounding rule of the display. Chosen
 * so the last digit is about the resolution a crew reads or sets the quantity to (a few
 * centimetres of CEP, a metre or foot of altitude, a tenth of a knot) and never finer than
 * what the model can tell apart. // common practice
 */
export const DECIMALS: { readonly [Q in Quantity]: Readonly<Record<QuantityUnit<Q>, number>> } = {
  distance: { m: 1, ft: 1 },
  height: { m: 0, ft: 0 },
  speed: { 'm/s': 1, kt: 1, 'km/h': 1 },
  time: { s: 1 },
  angle: { '°': 1 },
  bearing: { '°': 0 },
  coordinate: { '°': 6 },
  mass: { kg: 3 },
  energy: { J: 2 },
  percent: { '%': 1 },
  probability: { '': 2 },
  temperature: { K: 1 },
  ratio: { '': 3 },
  count: { '': 0 },
  cost: { '': 2 },
};

/** The unit a quantity is shown in under the person's preferences. */
export function quantityUnit(q: Quantity, prefs: Readonly<UnitPrefs>): string {
  if (q === 'distance' || q === 'height') return prefs.length;
  if (q === 'speed') return prefs.speed;
  return QUANTITY_UNITS[q][0];
}

/** Decimals of quantity q in unit (a unit q does not have: those of its stored unit). */
export function decimalsOf(q: Quantity, unit: string): number {
  const table = DECIMALS[q] as Record<string, number>;
  return table[unit] ?? table[QUANTITY_UNITS[q][0]];
}

/** A stored (SI) value of quantity q → the number shown in the preferred unit. */
export function toDisplay(si: number, q: Quantity, prefs: Readonly<UnitPrefs>): number {
  if (q === 'distance' || q === 'height') return toDisplayLength(si, prefs.length);
  if (q === 'speed') return toDisplaySpeed(si, prefs.speed);
  return si;
}

/** A number typed in the preferred unit of quantity q → the stored (SI) value. */
export function fromDisplay(value: number, q: Quantity, prefs: Readonly<UnitPrefs>): number {
  if (q === 'distance' || q === 'height') return fromDisplayLength(value, prefs.length);
  if (q === 'speed') return fromDisplaySpeed(value, prefs.speed);
  return value;
}

/** value.toFixed(digits) without a sign on a value that rounds to zero ("-0.0" reads as an error). */
function fixed(value: number, digits: number): string {
  const text = value.toFixed(digits);
  return /^-0(\.0*)?$/.test(text) ? text.slice(1) : text;
}

function formatValue(value: number, digits: number, label: string): string {
  // SI Brochure (9th ed.) 5.4.3: a space before the unit symbol, none before the degree sign.
  const tail = !label ? '' : label === '°' ? label : ` ${label}`;
  if (!Number.isFinite(value)) return `—${tail}`;
  return `${fixed(value, digits)}${tail}`;
}

/**
 * A stored (SI) value of quantity q as text in the preferred unit, rounded by DECIMALS, with the
 * unit: "32.8 ft", "1.4 kt", "0.90". NaN → "— ft".
 */
export function formatQuantity(si: number, q: Quantity, prefs: Readonly<UnitPrefs>): string {
  const unit = quantityUnit(q, prefs);
  return formatValue(toDisplay(si, q, prefs), decimalsOf(q, unit), unit);
}

/** Digits after the decimal point in the shortest text of a finite number (1e-7 → 7). */
function fractionDigits(v: number): number {
  const m = /^-?\d*(?:\.(\d+))?(?:e([+-]\d+))?$/.exec(String(v));
  if (!m) return Infinity;
  return Math.max(0, (m[1]?.length ?? 0) - Number(m[2] ?? 0));
}

/**
 * The text a number field shows for a stored (SI) value of quantity q. A value that is short in
 * the shown unit (at most two decimals past the rule: what someone typed, or a file gave) is shown
 * as it is, so nothing typed seems to change; anything longer (a unit conversion: 10 m is
 * 32.808 398 95… ft) is rounded by DECIMALS, trailing zeros dropped. Only the text is rounded:
 * the plan keeps the exact value until the field is edited.
 */
export function fieldText(si: number, q: Quantity, prefs: Readonly<UnitPrefs>): string {
  const v = toDisplay(si, q, prefs);
  if (!Number.isFinite(v)) return String(si);
  const d = decimalsOf(q, quantityUnit(q, prefs));
  // 12 significant digits drop a conversion's last-bit noise (33 ft → 10.0584 m → 33.000000000000004).
  const clean = Number(v.toPrecision(12));
  if (fractionDigits(clean) <= d + 2) return String(Object.is(clean, -0) ? 0 : clean);
  return String(Number(fixed(v, d)));
}

/** "110 m" / "361 ft": metres shown in unit with digits decimals (default: the height rule). */
export function formatLength(
  m: number,
  unit: LengthUnit,
  digits: number = DECIMALS.height[unit],
): string {
  return formatValue(toDisplayLength(m, unit), digits, LABELS.length[unit]);
}

/** "12.5 m/s" / "24.3 kt": m/s shown in unit with digits decimals (default: the speed rule). */
export function formatSpeed(
  mps: number,
  unit: SpeedUnit,
  digits: number = DECIMALS.speed[unit],
): string {
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
