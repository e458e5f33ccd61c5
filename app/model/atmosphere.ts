import {
  G0,
  LAPSE_K_PER_M,
  P0_PA,
  R_AIR,
  R_EARTH_GEOPOTENTIAL_M,
  T0_K,
  TROPOPAUSE_M,
} from './constants';

/** Air state at one altitude. */
export interface AirState {
  temperature_K: number;
  pressure_Pa: number;
  density_kgm3: number;
}

const EXPONENT = -G0 / (R_AIR * LAPSE_K_PER_M);
const T11_K = T0_K + LAPSE_K_PER_M * TROPOPAUSE_M;
const P11_PA = P0_PA * Math.pow(T11_K / T0_K, EXPONENT);

/** Geopotential altitude (m) of a geometric altitude z_m above mean sea level (USSA 1976 eq. 18). */
export function geopotentialAltitude(z_m: number): number {
  return (R_EARTH_GEOPOTENTIAL_M * z_m) / (R_EARTH_GEOPOTENTIAL_M + z_m);
}

/**
 * U.S. Standard Atmosphere 1976 below 20 km at geopotential altitude h_m, with the temperature
 * shifted by isaOffset_K: pressure stays the standard one, density follows p/(R·(T+ΔT)).
 * See docs/model.md §1. Above 20 km (out of scope) the isothermal layer is extended.
 */
export function isaAtGeopotential(h_m: number, isaOffset_K = 0): AirState {
  let t: number;
  let p: number;
  if (h_m <= TROPOPAUSE_M) {
    t = T0_K + LAPSE_K_PER_M * h_m;
    p = P0_PA * Math.pow(t / T0_K, EXPONENT);
  } else {
    t = T11_K;
    p = P11_PA * Math.exp((-G0 * (h_m - TROPOPAUSE_M)) / (R_AIR * T11_K));
  }
  const temperature_K = t + isaOffset_K;
  return { temperature_K, pressure_Pa: p, density_kgm3: p / (R_AIR * temperature_K) };
}

/** Air state at geometric altitude z_m above mean sea level (see isaAtGeopotential). */
export function airAt(z_m: number, isaOffset_K = 0): AirState {
  return isaAtGeopotential(geopotentialAltitude(z_m), isaOffset_K);
}

/** Density (kg/m³) at geometric altitude z_m MSL; the hot path of the descent tables. */
export function densityAt(z_m: number, isaOffset_K = 0): number {
  return airAt(z_m, isaOffset_K).density_kgm3;
}
