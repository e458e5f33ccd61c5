import fc from 'fast-check';
import { describe, expect, it } from 'vitest';
import {
  airAt,
  densityAt,
  geopotentialAltitude,
  isaAtGeopotential,
} from '../../app/model/atmosphere';
import { expectClose } from './helpers';
import ussa from '../fixtures/atmosphere/ussa1976.json';

// U.S. Standard Atmosphere 1976 (COESA), via docs/references.md (SEEN): see the fixture's source.
// Tolerances are half a unit of the last printed digit.
const USSA1976 = ussa.rows;

describe('U.S. Standard Atmosphere 1976 below the tropopause', () => {
  for (const row of USSA1976) {
    it(`matches the USSA 1976 table at ${row.H} m geopotential to the printed digits`, () => {
      const a = isaAtGeopotential(row.H);
      expectClose(a.temperature_K, row.T, 0.005, 'T');
      expectClose(a.pressure_Pa, row.p, 0.05, 'p');
      expectClose(a.density_kgm3, row.rho, 0.000005, 'rho');
    });
  }

  // USSA 1976 tropopause (docs/references.md, SEEN): 216.65 K, 22632.1 Pa, 0.363918 kg/m³. The 1976
  // tables print this pressure as 2.2632E+04 (from memory); the equations with R = 287.05287
  // give 22632.04 Pa, so the pressure check allows 0.1 Pa (4e-6 relative), not half a digit.
  it('gives the USSA 1976 tropopause values at 11 000 m geopotential', () => {
    const a = isaAtGeopotential(11000);
    expectClose(a.temperature_K, 216.65, 0.005, 'T');
    expectClose(a.pressure_Pa, 22632.1, 0.1, 'p');
    expectClose(a.density_kgm3, 0.363918, 0.0000005, 'rho');
  });

  // USSA 1976: 11–20 km is isothermal at 216.65 K with p = p11·exp(−g0 (H − 11 km)/(R T11)).
  it('keeps 216.65 K above the tropopause and decays pressure with the isothermal scale height', () => {
    const a = isaAtGeopotential(15000);
    expectClose(a.temperature_K, 216.65, 1e-9, 'T');
    const scaleHeight_m = (287.05287 * 216.65) / 9.80665;
    const p11 = isaAtGeopotential(11000).pressure_Pa;
    expectClose(a.pressure_Pa, p11 * Math.exp(-4000 / scaleHeight_m), 1e-6, 'p');
  });

  it('density is pressure over R·T (ideal gas law) at every altitude', () => {
    fc.assert(
      fc.property(fc.double({ min: -500, max: 20000, noNaN: true }), (h) => {
        const a = isaAtGeopotential(h);
        expectClose(a.density_kgm3, a.pressure_Pa / (287.05287 * a.temperature_K), 1e-12);
      }),
      { numRuns: 50 },
    );
  });
});

describe('ISA temperature offset', () => {
  // Common practice for ISA+ΔT days: the standard pressure at each altitude is kept and the
  // temperature shifted, so density scales by T/(T+ΔT) (ideal gas law).
  it('keeps the standard pressure and scales density by T/(T+ΔT)', () => {
    fc.assert(
      fc.property(
        fc.double({ min: 0, max: 6000, noNaN: true }),
        fc.double({ min: -40, max: 40, noNaN: true }),
        (h, dT) => {
          const std = isaAtGeopotential(h);
          const off = isaAtGeopotential(h, dT);
          expectClose(off.pressure_Pa, std.pressure_Pa, 1e-9 * std.pressure_Pa, 'p');
          expectClose(off.temperature_K, std.temperature_K + dT, 1e-9, 'T');
          const ratio = std.temperature_K / (std.temperature_K + dT);
          expectClose(off.density_kgm3, std.density_kgm3 * ratio, 1e-12, 'rho');
        },
      ),
      { numRuns: 100 },
    );
  });

  it('makes hot air thinner and cold air denser at 1000 m (USSA 1976 1.11164 kg/m³ standard)', () => {
    expect(isaAtGeopotential(1000, 15).density_kgm3).toBeLessThan(1.11164);
    expect(isaAtGeopotential(1000, -15).density_kgm3).toBeGreaterThan(1.11164);
    // 281.65 / 296.65 of the table density.
    expectClose(isaAtGeopotential(1000, 15).density_kgm3, (1.11164 * 281.65) / 296.65, 1e-5);
  });
});

describe('geometric and geopotential altitude', () => {
  // docs/references.md: at 1000 m geometric and geopotential altitude differ by 0.16 m
  // (USSA 1976 eq. 18, r0 = 6 356 766 m).
  it('puts 1000 m geometric about 0.16 m above 1000 m geopotential', () => {
    expectClose(1000 - geopotentialAltitude(1000), 0.16, 0.005, 'difference');
    expect(geopotentialAltitude(0)).toBe(0);
  });

  it('airAt takes geometric altitude: 1000.157 m geometric gives the 1000 m geopotential row', () => {
    const z = (6356766 * 1000) / (6356766 - 1000); // inverse of eq. 18
    const a = airAt(z);
    expectClose(a.temperature_K, 281.65, 0.005, 'T');
    expectClose(a.pressure_Pa, 89874.6, 0.05, 'p');
    expectClose(a.density_kgm3, 1.11164, 0.000005, 'rho');
    expectClose(densityAt(z), 1.11164, 0.000005, 'densityAt');
  });

  it('airAt at 1000 m geometric is lower in the atmosphere than the geopotential row would say', () => {
    // Density falls with height, so 0.16 m less geopotential altitude means slightly denser air.
    expect(airAt(1000).density_kgm3).toBeGreaterThan(isaAtGeopotential(1000).density_kgm3);
  });
});
