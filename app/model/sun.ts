/**
 * Solar position and civil twilight by the NOAA solar calculator equations, which are the
 * low-accuracy solar coordinates of Meeus, Astronomical Algorithms, 2nd ed. (1998), ch. 25
 * (apparent longitude, obliquity with the nutation term in Ω) and the equation of time of ch. 28
 * (Smart's series). Good to well under a minute of time for dates within a few centuries of 2000.
 *
 * Elevations are geometric (the sun's centre, no refraction), which is how civil twilight is
 * defined: the centre 6° below the horizon. Pure; NaN in gives NaN or null out.
 */

const DEG = Math.PI / 180;
const DAY_MS = 86_400_000;
// Unix epoch as a Julian Day (Meeus ch. 7: JD 2440587.5 = 1970-01-01 0h UT).
const JD_UNIX_EPOCH = 2440587.5;
// J2000.0 (Meeus eq. 25.1 counts Julian centuries from it).
const JD_J2000 = 2451545;
// Civil twilight: the sun's centre 6° below the horizon (common practice; almanac definition).
const CIVIL_DEPRESSION_DEG = 6;

/** Sun's apparent declination (deg) and equation of time (minutes) at a moment. */
export interface SolarCoordinates {
  declination_deg: number;
  /** Apparent minus mean solar time, minutes. */
  equationOfTime_min: number;
}

/** Civil dawn and dusk for one local solar day; both null when the day has neither. */
export interface CivilTwilight {
  dawn: Date | null;
  dusk: Date | null;
  /** 'day': the sun stays above −6° all day; 'night': it never climbs to −6°; else null. */
  polar: 'day' | 'night' | null;
}

/** Solar declination and equation of time at time t_ms (ms since the Unix epoch, UT). */
export function solarCoordinates(t_ms: number): SolarCoordinates {
  // Meeus eq. 25.1: Julian centuries of 36525 days from J2000.0 (UT used for TT; < 0.1 s of arc).
  const T = (t_ms / DAY_MS + JD_UNIX_EPOCH - JD_J2000) / 36525;
  // Meeus eqs. 25.2–25.4: geometric mean longitude, mean anomaly, eccentricity.
  const L0 = (280.46646 + T * (36000.76983 + 0.0003032 * T)) % 360;
  const M = 357.52911 + T * (35999.05029 - 0.0001537 * T);
  const e = 0.016708634 - T * (0.000042037 + 0.0000001267 * T);
  // Meeus ch. 25: equation of the centre.
  const C =
    Math.sin(M * DEG) * (1.914602 - T * (0.004817 + 0.000014 * T)) +
    Math.sin(2 * M * DEG) * (0.019993 - 0.000101 * T) +
    Math.sin(3 * M * DEG) * 0.000289;
  // Meeus ch. 25: apparent longitude, correcting for nutation and aberration.
  const omega = 125.04 - 1934.136 * T;
  const lambda = L0 + C - 0.00569 - 0.00478 * Math.sin(omega * DEG);
  // Meeus eq. 22.2 (mean obliquity) and eq. 25.8 (apparent obliquity).
  const eps0 = 23 + (26 + (21.448 - T * (46.815 + T * (0.00059 - T * 0.001813))) / 60) / 60;
  const eps = (eps0 + 0.00256 * Math.cos(omega * DEG)) * DEG;
  // Meeus eq. 25.7: apparent declination.
  const dec = Math.asin(Math.sin(eps) * Math.sin(lambda * DEG));
  // Meeus eq. 28.3 (Smart): equation of time in radians, ×4 min per degree.
  const y = Math.tan(eps / 2) ** 2;
  const l0 = L0 * DEG;
  const m = M * DEG;
  const E =
    y * Math.sin(2 * l0) -
    2 * e * Math.sin(m) +
    4 * e * y * Math.sin(m) * Math.cos(2 * l0) -
    0.5 * y * y * Math.sin(4 * l0) -
    1.25 * e * e * Math.sin(2 * m);
  return { declination_deg: dec / DEG, equationOfTime_min: (4 * E) / DEG };
}

/** Geometric elevation (deg, no refraction) of the sun's centre at date seen from lat, lon (deg). */
export function sunElevationDeg(date: Date, lat: number, lon: number): number {
  const t = date.getTime();
  const { declination_deg, equationOfTime_min } = solarCoordinates(t);
  // True solar time (min) → hour angle (deg), NOAA solar calculator.
  const utcMin = (((t % DAY_MS) + DAY_MS) % DAY_MS) / 60000;
  const hourAngle = (utcMin + equationOfTime_min + 4 * lon) / 4 - 180;
  const phi = lat * DEG;
  const dec = declination_deg * DEG;
  const sinAlt =
    Math.sin(phi) * Math.sin(dec) + Math.cos(phi) * Math.cos(dec) * Math.cos(hourAngle * DEG);
  return Math.asin(Math.max(-1, Math.min(1, sinAlt))) / DEG;
}

/** cos of the hour angle at which the sun's centre is `depression` degrees below the horizon. */
function cosHourAngle(lat: number, dec_deg: number, depression: number): number {
  const phi = lat * DEG;
  const dec = dec_deg * DEG;
  return (
    (Math.sin(-depression * DEG) - Math.sin(phi) * Math.sin(dec)) / (Math.cos(phi) * Math.cos(dec))
  );
}

/** Solar transit (ms) of the solar day starting at local mean midnight day0_ms. */
function transit(day0_ms: number): number {
  // Start from local mean noon and correct by the equation of time there (twice converges).
  let t = day0_ms + DAY_MS / 2;
  for (let i = 0; i < 2; i++) {
    t = day0_ms + DAY_MS / 2 - solarCoordinates(t).equationOfTime_min * 60000;
  }
  return t;
}

/**
 * Civil dawn and dusk (sun's centre 6° below the horizon) at lat, lon (deg) for the local mean
 * solar day containing `date` (midnight to midnight at that longitude). In a polar day or night
 * both are null and `polar` says which.
 */
export function civilTwilight(date: Date, lat: number, lon: number): CivilTwilight {
  const t = date.getTime();
  if (!Number.isFinite(t) || !Number.isFinite(lat) || !Number.isFinite(lon)) {
    return { dawn: null, dusk: null, polar: null };
  }
  // Local mean solar midnight (UT ms) that starts the day: mean time = UT + lon/15 h.
  const offset = (lon / 360) * DAY_MS;
  const day0 = Math.floor((t + offset) / DAY_MS) * DAY_MS - offset;
  const noon = transit(day0);
  const c = cosHourAngle(lat, solarCoordinates(noon).declination_deg, CIVIL_DEPRESSION_DEG);
  if (c > 1) return { dawn: null, dusk: null, polar: 'night' };
  if (c < -1) return { dawn: null, dusk: null, polar: 'day' };
  const dawn = crossingFrom(day0, noon, lat, -1);
  const dusk = crossingFrom(day0, noon, lat, 1);
  return {
    dawn: dawn === null ? null : new Date(Math.round(dawn)),
    dusk: dusk === null ? null : new Date(Math.round(dusk)),
    polar: null,
  };
}

/** Time (ms) the centre crosses −6° on the `sign` side of noon (−1 morning), or null if it does not. */
function crossingFrom(day0: number, noon: number, lat: number, sign: -1 | 1): number | null {
  let t = noon;
  for (let i = 0; i < 4; i++) {
    const sc = solarCoordinates(t);
    const c = cosHourAngle(lat, sc.declination_deg, CIVIL_DEPRESSION_DEG);
    if (!(Math.abs(c) <= 1)) return null;
    // Hour angle (deg) to minutes of time from apparent noon, with the equation of time at the event.
    const apparentNoon = day0 + DAY_MS / 2 - sc.equationOfTime_min * 60000;
    t = apparentNoon + ((sign * Math.acos(c)) / DEG / 15) * 3_600_000;
  }
  return t;
}
