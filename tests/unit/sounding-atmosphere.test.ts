import fc from 'fast-check';
import { describe, expect, it } from 'vitest';
import { airAt, densityAt } from '../../app/model/atmosphere';
import { SoundingAtmosphere } from '../../app/model/sounding-atmosphere';
import { expectClose } from './helpers';
import ussa from '../fixtures/atmosphere/ussa1976.json';

// U.S. Standard Atmosphere 1976: g0 = 9.80665 m/s², R = 287.05287 J/(kg·K), effective Earth radius
// r0 = 6356766 m for geopotential altitude H = r0·z/(r0 + z) (eq. 18), so z = r0·H/(r0 − H).
const G0 = 9.80665;
const R = 287.05287;
const R0 = 6356766;
const geometric = (H: number) => (R0 * H) / (R0 - H);
const geopotential = (z: number) => (R0 * z) / (R0 + z);

// U.S. Standard Atmosphere 1976 table (docs/references.md), geopotential altitude H: the fixture.
const USSA = ussa.rows;

describe('hydrostatic density from a sounding', () => {
  // A standard sounding: T = 288.15 − 0.0065·H K every 1000 geopotential m (USSA 1976 troposphere),
  // given at the geometric altitudes of those levels, sea-level pressure 101325 Pa.
  const standard = [0, 1000, 2000, 3000, 4000, 5000, 6000].map((H) => ({
    altitude_m: geometric(H),
    temperature_K: 288.15 - 0.0065 * H,
  }));
  const atm = new SoundingAtmosphere(standard, { surfacePressure_Pa: 101325 });

  it('equals the USSA 1976 table density at 0…5 km within 0.1 %', () => {
    for (const row of USSA) {
      // U.S. Standard Atmosphere 1976, table values in docs/references.md.
      const z = geometric(row.H);
      expectClose(atm.densityAt(z) / row.rho, 1, 1e-3, `ρ at H = ${row.H} m`);
      expectClose(atm.airAt(z).pressure_Pa / row.p, 1, 1e-5, `p at H = ${row.H} m`);
      expectClose(atm.airAt(z).temperature_K, row.T, 1e-9, `T at H = ${row.H} m`);
    }
  });

  it('equals the core USSA atmosphere between the levels', () => {
    for (let z = 0; z <= 6000; z += 137) {
      expectClose(atm.densityAt(z) / densityAt(z), 1, 1e-9, `z = ${z} m`);
    }
  });

  it('takes the USSA pressure at the lowest level when no surface pressure is given', () => {
    const fromKm = new SoundingAtmosphere(standard.slice(1));
    const z = geometric(1000);
    expectClose(fromKm.airAt(z).pressure_Pa, 89874.6, 0.1); // USSA 1976 table, H = 1000 m
    expectClose(fromKm.densityAt(geometric(3000)), 0.90912, 1e-5); // USSA 1976 table, H = 3000 m
  });

  it('matches the exponential closed form in an isothermal layer', () => {
    // Hydrostatic equation with constant T: p = p0·exp(−g0·ΔH/(R·T)) (the USSA 1976 isothermal-layer form).
    const T = 250;
    const p0 = 100000;
    const iso = new SoundingAtmosphere(
      [
        { altitude_m: 200, temperature_K: T },
        { altitude_m: 3200, temperature_K: T },
      ],
      { surfacePressure_Pa: p0 },
    );
    for (const z of [200, 700, 1650, 3200, 4000]) {
      const p = p0 * Math.exp((-G0 * (geopotential(z) - geopotential(200))) / (R * T));
      expectClose(iso.airAt(z).pressure_Pa / p, 1, 1e-12, `p at ${z} m`);
      expectClose(iso.densityAt(z), p / (R * T), 1e-12, `ρ at ${z} m`);
    }
  });

  it('reads AGL temperatures above the given ground', () => {
    const agl = new SoundingAtmosphere(
      [
        { altitude_m: 0, temperature_K: 290 },
        { altitude_m: 1000, temperature_K: 284 },
      ],
      { reference: 'AGL', groundElevation_m: 500 },
    );
    expectClose(agl.airAt(1000).temperature_K, 287, 1e-3);
    expectClose(agl.airAt(500).pressure_Pa, airAt(500).pressure_Pa, 1e-9);
  });

  it('is the USSA atmosphere with no usable temperatures', () => {
    const empty = new SoundingAtmosphere([{ altitude_m: NaN, temperature_K: 280 }]);
    expect(empty.densityAt(1234)).toBe(densityAt(1234));
  });

  it('has density falling with height for any plausible sounding', () => {
    // common practice: in a hydrostatic atmosphere with realistic lapse rates density decreases.
    fc.assert(
      fc.property(
        fc.array(fc.double({ min: 230, max: 310, noNaN: true }), { minLength: 1, maxLength: 8 }),
        (temps) => {
          // Lapse rates within ±10 K/km, below the autoconvective 34 K/km (from memory).
          const levels = temps.map((_, i) => ({
            altitude_m: i * 1000,
            temperature_K: 280 + (temps[i] - 270) / 4,
          }));
          const a = new SoundingAtmosphere(levels);
          let prev = Infinity;
          for (let z = -200; z <= 9000; z += 250) {
            const rho = a.densityAt(z);
            expect(rho).toBeLessThan(prev);
            prev = rho;
          }
        },
      ),
    );
  });
});

describe('degenerate soundings', () => {
  // Hydrostatic balance (USSA 1976 eq. 33a) gives a finite density wherever the temperature is
  // finite and positive; two levels a denormal apart must not make a layer of zero thickness.
  it('levels closer than 1 mm count once and keep every density finite', () => {
    const a = new SoundingAtmosphere([
      { altitude_m: 0, temperature_K: 288 },
      { altitude_m: 5e-324, temperature_K: 250 },
      { altitude_m: 0.0004, temperature_K: 240 },
      { altitude_m: 1000, temperature_K: 281.5 },
    ]);
    expect(Array.from(a.T)).toEqual([288, 281.5]);
    for (const z of [-100, 0, 1e-320, 0.0002, 500, 1000, 3000]) {
      expect(Number.isFinite(a.densityAt(z)), `z = ${z}`).toBe(true);
    }
  });

  it('of equal altitudes the first given is used', () => {
    const a = new SoundingAtmosphere([
      { altitude_m: 100, temperature_K: 280 },
      { altitude_m: 100, temperature_K: 300 },
    ]);
    expect(Array.from(a.T)).toEqual([280]);
  });
});
