/** Physical constants used by the core. Each cites its source on the line above. */

// U.S. Standard Atmosphere 1976 (COESA), Table 2: standard gravity, m/s².
export const G0 = 9.80665;
// U.S. Standard Atmosphere 1976: specific gas constant of dry air R*/M0, J/(kg·K).
export const R_AIR = 287.05287;
// U.S. Standard Atmosphere 1976: sea-level temperature, K.
export const T0_K = 288.15;
// U.S. Standard Atmosphere 1976: sea-level pressure, Pa.
export const P0_PA = 101325;
// U.S. Standard Atmosphere 1976: sea-level density, kg/m³ (the reference of descentRate_mps).
export const RHO0 = 1.225;
// U.S. Standard Atmosphere 1976: troposphere temperature gradient, K per geopotential m.
export const LAPSE_K_PER_M = -0.0065;
// U.S. Standard Atmosphere 1976: base of the tropopause, geopotential m.
export const TROPOPAUSE_M = 11000;
// U.S. Standard Atmosphere 1976: effective Earth radius for geopotential altitude, m.
export const R_EARTH_GEOPOTENTIAL_M = 6356766;
// WGS 84 (NIMA TR8350.2): semi-major axis, m.
export const WGS84_A = 6378137;
// WGS 84 (NIMA TR8350.2): flattening.
export const WGS84_F = 1 / 298.257223563;
// Power-law exponent for wind below the lowest layer over open land: 1/7 (common practice).
export const DEFAULT_SURFACE_EXPONENT = 1 / 7;
// Metres per international foot (exact, 1959 international yard and pound agreement).
export const M_PER_FT = 0.3048;
// Metres per second per international knot (exact: 1852 m per hour).
export const MPS_PER_KT = 1852 / 3600;
