/**
 * Magnetic declination from the World Magnetic Model 2025 (NOAA NCEI / BGS) via the
 * `geomagnetism` package. See docs/decisions/0001-geomagnetism-wmm2025.md.
 *
 * `geomagnetism` loads its coefficients with `require('./data/wmm-20xx.json')` (no fs), which
 * both Node and vite's CommonJS handling resolve, so the same code runs in the browser.
 */
import geomagnetism from 'geomagnetism';

/** Declination at a point and time, with the model that produced it. */
export interface Declination {
  /** Declination in degrees, positive east of true north. */
  declination_deg: number;
  /** Model name as the package reports it, e.g. "WMM-2025". */
  model: string;
  /** Start of the model's validity, ISO 8601 UTC. */
  validFrom: string;
  /** End of the model's validity, ISO 8601 UTC. */
  validTo: string;
}

// The only model we accept; the older ones the package still ships have expired.
const MODEL_NAME = 'WMM-2025';
// Validity as published with WMM2025 and carried in the package's wmm-2025.json; a test
// checks these against the model the package returns.
const VALID_FROM = new Date('2024-11-13T03:00:00.000Z');
const VALID_TO = new Date('2029-11-13T03:00:00.000Z');

/** The WMM2025 validity window used by magneticDeclination, ISO 8601 UTC. */
export const WMM_VALIDITY = {
  model: MODEL_NAME,
  validFrom: VALID_FROM.toISOString(),
  validTo: VALID_TO.toISOString(),
} as const;

/**
 * Magnetic declination (degrees, east positive) at lat, lon (WGS84 degrees), date, and height
 * altitude_m (metres above the WGS84 ellipsoid). Throws if the date lies outside WMM2025's
 * validity rather than fall back to an expired model.
 */
export function magneticDeclination(
  lat: number,
  lon: number,
  date: Date,
  altitude_m = 0,
): Declination {
  const t = date.getTime();
  if (!(t >= VALID_FROM.getTime() && t <= VALID_TO.getTime())) {
    const when = Number.isNaN(t) ? 'an invalid date' : date.toISOString();
    throw new Error(
      `Magnetic declination: ${when} is outside the validity of ${MODEL_NAME} ` +
        `(${WMM_VALIDITY.validFrom} to ${WMM_VALIDITY.validTo}); choose a date in that range.`,
    );
  }
  const model = geomagnetism.model(date);
  if (model.name !== MODEL_NAME) {
    // Only if a package upgrade changes which model covers this window.
    throw new Error(`Magnetic declination: expected ${MODEL_NAME}, package chose ${model.name}`);
  }
  // The package takes [lat, lon, height above ellipsoid in km].
  const point = model.point([lat, lon, altitude_m / 1000]);
  return {
    declination_deg: point.decl,
    model: model.name,
    validFrom: WMM_VALIDITY.validFrom,
    validTo: WMM_VALIDITY.validTo,
  };
}

/** Magnetic heading in degrees [0, 360) from a true heading trueDeg and declination_deg (east positive). */
export function magneticHeading(trueDeg: number, declination_deg: number): number {
  const d = (((trueDeg - declination_deg) % 360) + 360) % 360;
  return d === 360 ? 0 : d;
}
