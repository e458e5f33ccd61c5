import fc from 'fast-check';
import { describe, expect, it } from 'vitest';
import { WindProfile, windComponents, windFromComponents } from '../../app/model/wind';
import { expectClose } from './helpers';

/** Signed difference of two angles in degrees, wrapped into (−180, 180]. */
const angleDiff = (a: number, b: number): number => ((((a - b) % 360) + 540) % 360) - 180;

describe('meteorological wind components', () => {
  // WMO convention (common practice): wind direction is where the wind blows FROM, degrees true.
  it('wind from 270° blows toward the east', () => {
    const w = windComponents(270, 5);
    expectClose(w.east_mps, 5, 1e-12, 'east');
    expectClose(w.north_mps, 0, 1e-12, 'north');
  });

  it('wind from 0° (north) blows toward the south and wind from 90° toward the west', () => {
    expectClose(windComponents(0, 4).north_mps, -4, 1e-12);
    expectClose(windComponents(0, 4).east_mps, 0, 1e-12);
    expectClose(windComponents(90, 4).east_mps, -4, 1e-12);
  });

  it('wind from 225° (south-west) has equal north-east components of speed·cos 45°', () => {
    const w = windComponents(225, 10);
    expectClose(w.east_mps, 10 * Math.SQRT1_2, 1e-12);
    expectClose(w.north_mps, 10 * Math.SQRT1_2, 1e-12);
  });

  it('components and from-direction/speed round-trip', () => {
    fc.assert(
      fc.property(
        fc.double({ min: 0, max: 359.999, noNaN: true }),
        fc.double({ min: 0.01, max: 80, noNaN: true }),
        (fromDeg, speed) => {
          const back = windFromComponents(windComponents(fromDeg, speed));
          expectClose(back.speed_mps, speed, 1e-9 * speed, 'speed');
          expectClose(angleDiff(back.fromDeg, fromDeg), 0, 1e-9, 'fromDeg');
          expect(back.fromDeg).toBeGreaterThanOrEqual(0);
          expect(back.fromDeg).toBeLessThan(360);
        },
      ),
      { numRuns: 200 },
    );
  });

  it('a zero vector is calm with speed 0', () => {
    expect(windFromComponents({ east_mps: 0, north_mps: 0 }).speed_mps).toBe(0);
  });
});

describe('wind profile between layers', () => {
  const layers = [
    { altitude_m: 100, fromDeg: 270, speed_mps: 10 },
    { altitude_m: 200, fromDeg: 180, speed_mps: 10 },
  ];

  // Closed form: interpolating the components (not the direction) of two equal-speed winds 90°
  // apart gives, half-way, speed |v|·cos 45° from the bisecting direction.
  it('a 90° veer between two layers gives |v|·cos 45° half-way, from the mean direction', () => {
    const wp = new WindProfile(layers, { reference: 'MSL' });
    const mid = windFromComponents(wp.at(150));
    expectClose(mid.speed_mps, 10 * Math.cos(Math.PI / 4), 1e-12, 'speed');
    expectClose(mid.fromDeg, 225, 1e-9, 'direction');
  });

  it('components are linear in altitude between layers', () => {
    const wp = new WindProfile(layers, { reference: 'MSL' });
    fc.assert(
      fc.property(fc.double({ min: 0, max: 1, noNaN: true }), (t) => {
        const w = wp.at(100 + 100 * t);
        expectClose(w.east_mps, 10 * (1 - t), 1e-9, 'east');
        expectClose(w.north_mps, 10 * t, 1e-9, 'north');
      }),
      { numRuns: 50 },
    );
  });

  it('takes layers in any order and returns each layer exactly at its altitude', () => {
    const wp = new WindProfile([layers[1], layers[0]], { reference: 'MSL' });
    expectClose(wp.at(100).east_mps, 10, 1e-12);
    expectClose(wp.at(200).north_mps, 10, 1e-12);
  });

  it('is constant above the top layer', () => {
    const wp = new WindProfile(layers, { reference: 'MSL' });
    for (const z of [200, 250, 1000, 9000]) {
      expectClose(wp.at(z).east_mps, 0, 1e-12);
      expectClose(wp.at(z).north_mps, 10, 1e-12);
    }
  });

  it('AGL layers sit above the plan ground and MSL layers do not', () => {
    const agl = new WindProfile(layers, { reference: 'AGL', groundElevation_m: 300 });
    const msl = new WindProfile(layers, { reference: 'MSL', groundElevation_m: 50 });
    expectClose(agl.at(450).east_mps, 5, 1e-12);
    expectClose(msl.at(150).east_mps, 5, 1e-12);
    expect(agl.breakpoints()).toEqual([400, 500]);
    expect(msl.breakpoints()).toEqual([100, 200]);
  });
});

describe('wind near the ground', () => {
  const low = [{ altitude_m: 50, fromDeg: 270, speed_mps: 8 }];

  // Power law u(h) = u_low·(h/h_low)^α; α = 1/7 over open land (common practice).
  it('follows u(h) = u_low (h/h_low)^(1/7) below the lowest layer by default', () => {
    const wp = new WindProfile(low, { reference: 'AGL', groundElevation_m: 120 });
    for (const h of [1, 5, 10, 25, 49]) {
      expectClose(wp.at(120 + h).east_mps, 8 * Math.pow(h / 50, 1 / 7), 1e-9, `h ${h}`);
    }
    // Hand value: (10/50)^(1/7) = e^(ln 0.2 / 7) = 0.79460, so 6.357 m/s at 10 m.
    expectClose(wp.at(130).east_mps, 6.357, 0.001, '10 m');
  });

  // IEC 61400-1 normal wind profile: α = 0.2.
  it('follows the IEC 61400-1 normal wind profile with α = 0.2', () => {
    const wp = new WindProfile(low, { reference: 'AGL', surfaceExponent: 0.2 });
    for (const h of [2, 10, 30]) {
      expectClose(wp.at(h).east_mps, 8 * Math.pow(h / 50, 0.2), 1e-9, `h ${h}`);
    }
    // Hand value: (10/50)^0.2 = 0.72478, so 5.798 m/s at 10 m.
    expectClose(wp.at(10).east_mps, 5.798, 0.001, '10 m');
  });

  it('is zero at and below the plan ground', () => {
    const wp = new WindProfile(low, { reference: 'AGL', groundElevation_m: 120 });
    for (const z of [120, 119, 0, -50]) {
      expect(wp.at(z).east_mps).toBe(0);
      expect(wp.at(z).north_mps).toBe(0);
    }
  });

  it('with no layers is calm at every altitude', () => {
    const wp = new WindProfile([]);
    for (const z of [-10, 0, 100, 5000]) {
      expect(wp.at(z)).toEqual({ east_mps: 0, north_mps: 0 });
    }
  });

  it('a single layer at the ground is uniform above it', () => {
    const wp = new WindProfile([{ altitude_m: 0, fromDeg: 90, speed_mps: 4 }]);
    for (const z of [0, 1, 50, 700]) expectClose(wp.at(z).east_mps, -4, 1e-12);
  });
});
