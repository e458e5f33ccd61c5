import fc from 'fast-check';
import * as SunCalc from 'suncalc';
import { describe, expect, it } from 'vitest';
import { civilTwilight, solarCoordinates, sunElevationDeg } from '../../app/model/sun';
import { expectClose } from './helpers';

const DAY_MS = 86_400_000;
const MIN_MS = 60_000;

/** Local mean noon (UT) of the solar day at lon containing instant t_ms. */
function localMeanNoon(t_ms: number, lon: number): Date {
  const offset = (lon / 360) * DAY_MS;
  return new Date(Math.floor((t_ms + offset) / DAY_MS) * DAY_MS - offset + DAY_MS / 2);
}

const place = fc.record({
  t: fc.integer({ min: Date.UTC(1990, 0, 1), max: Date.UTC(2060, 0, 1) }),
  lat: fc.double({ min: -60, max: 60, noNaN: true }),
  lon: fc.double({ min: -180, max: 180, noNaN: true }),
});

describe('civil twilight', () => {
  it('matches the suncalc reference library within 2 minutes for |lat| ≤ 60°', () => {
    // Reference library: suncalc 2.0.2, getTimes().dawn / .dusk (sun's centre at −6°).
    fc.assert(
      fc.property(place, ({ t, lat, lon }) => {
        const noon = localMeanNoon(t, lon);
        const mine = civilTwilight(noon, lat, lon);
        const ref = SunCalc.getTimes(noon, lat, lon);
        expect(mine.polar).toBeNull();
        expect(ref.dawn).not.toBeNull();
        expect(ref.dusk).not.toBeNull();
        expectClose(mine.dawn!.getTime(), ref.dawn!.getTime(), 2 * MIN_MS, 'dawn ms');
        expectClose(mine.dusk!.getTime(), ref.dusk!.getTime(), 2 * MIN_MS, 'dusk ms');
      }),
      { numRuns: 300 },
    );
  });

  it('gives the same dawn and dusk for any instant of the same local solar day', () => {
    fc.assert(
      fc.property(place, fc.double({ min: 0.001, max: 0.999, noNaN: true }), (p, frac) => {
        const noon = localMeanNoon(p.t, p.lon).getTime();
        const a = civilTwilight(new Date(noon), p.lat, p.lon);
        const b = civilTwilight(new Date(noon - DAY_MS / 2 + frac * DAY_MS), p.lat, p.lon);
        expect(b.dawn?.getTime()).toBe(a.dawn?.getTime());
        expect(b.dusk?.getTime()).toBe(a.dusk?.getTime());
      }),
      { numRuns: 100 },
    );
  });

  it('puts the sun 6° below the horizon at dawn and dusk', () => {
    // Definition of civil twilight (common practice; almanac definition).
    fc.assert(
      fc.property(place, ({ t, lat, lon }) => {
        const tw = civilTwilight(new Date(t), lat, lon);
        expectClose(sunElevationDeg(tw.dawn!, lat, lon), -6, 0.01, 'elevation at dawn');
        expectClose(sunElevationDeg(tw.dusk!, lat, lon), -6, 0.01, 'elevation at dusk');
      }),
      { numRuns: 200 },
    );
  });

  it('matches the almanac for Washington, DC on 21 June 2024', () => {
    // U.S. Naval Observatory, sun and moon data for Washington, DC (38.8895° N, 77.0353° W),
    // 2024-06-21: civil twilight begins 05:11 EDT, ends 21:09 EDT (UTC−4). // from memory
    const tw = civilTwilight(new Date('2024-06-21T16:00:00Z'), 38.8895, -77.0353);
    expectClose(tw.dawn!.getTime(), Date.parse('2024-06-21T09:11:00Z'), 3 * MIN_MS, 'dawn');
    expectClose(tw.dusk!.getTime(), Date.parse('2024-06-22T01:09:00Z'), 3 * MIN_MS, 'dusk');
  });

  it('lasts 12 h 48 min at the equator at an equinox', () => {
    // Hand calculation: at φ = 0, δ ≈ 0 the hour angle of −6° is 96°, so dusk − dawn is
    // 2 × 96° / (15°/h) = 12.8 h. Declination on 2025-03-20 is within 0.2° of 0 (equinox 09:01 UT).
    const tw = civilTwilight(new Date('2025-03-20T12:00:00Z'), 0, 0);
    expectClose(tw.dusk!.getTime() - tw.dawn!.getTime(), 12.8 * 3_600_000, 1 * MIN_MS, 'length');
  });

  it('reports polar day and polar night at 78° N and 78° S', () => {
    // Hand calculation: at 78° N with δ = +23.44° the lowest elevation is δ − (90° − φ) = 11.4°
    // (never below −6°); with δ = −23.44° the highest is 90° − φ + δ = −11.4° (never above −6°).
    const june = new Date('2025-06-21T12:00:00Z');
    const december = new Date('2025-12-21T12:00:00Z');
    expect(civilTwilight(june, 78, 15)).toEqual({ dawn: null, dusk: null, polar: 'day' });
    expect(civilTwilight(december, 78, 15)).toEqual({ dawn: null, dusk: null, polar: 'night' });
    expect(civilTwilight(june, -78, 15).polar).toBe('night');
    expect(civilTwilight(december, -78, 15).polar).toBe('day');
    // The reference library agrees that neither event happens (suncalc 2.0.2 returns null).
    expect(SunCalc.getTimes(june, 78, 15).dawn).toBeNull();
    expect(SunCalc.getTimes(december, 78, 15).dusk).toBeNull();
  });

  it('returns nulls for NaN input', () => {
    expect(civilTwilight(new Date(NaN), 10, 10)).toEqual({ dawn: null, dusk: null, polar: null });
  });
});

describe('sun position', () => {
  it('matches the suncalc reference library elevation within 0.02°', () => {
    // suncalc 2.0.2 getPosition().altitude is apparent: geometric plus Sæmundsson's refraction
    // R = 1.02′ / tan(h + 10.3/(h + 5.11)) (Meeus, Astronomical Algorithms, eq. 16.4), with h
    // clamped at 0. Ours is geometric, so add the same refraction before comparing.
    const refraction = (h: number): number => {
      const x = Math.max(0, h);
      return 1.02 / Math.tan(((x + 10.3 / (x + 5.11)) * Math.PI) / 180) / 60;
    };
    fc.assert(
      fc.property(
        place,
        fc.integer({ min: 0, max: DAY_MS - 1 }),
        fc.double({ min: -89, max: 89, noNaN: true }),
        ({ t, lon }, ms, lat) => {
          const date = new Date(Math.floor(t / DAY_MS) * DAY_MS + ms);
          const mine = sunElevationDeg(date, lat, lon);
          const ref = SunCalc.getPosition(date, lat, lon).altitude;
          expectClose(mine + refraction(mine), ref, 0.02, 'elevation deg');
        },
      ),
      { numRuns: 300 },
    );
  });

  it('gives the solstice declination and a near-zero equinox declination', () => {
    // Obliquity ε ≈ 23.44° in 2025 (Meeus eq. 22.2); the June solstice 2025 fell at 02:42 UT
    // on 21 June and the March equinox at 09:01 UT on 20 March (almanac; from memory).
    expectClose(solarCoordinates(Date.parse('2025-06-21T02:42:00Z')).declination_deg, 23.44, 0.01);
    expectClose(solarCoordinates(Date.parse('2025-03-20T09:01:00Z')).declination_deg, 0, 0.01);
  });

  it('gives the equation of time near its November maximum of about +16.4 min', () => {
    // Equation of time peaks near +16.4 min around 3 November (Meeus ch. 28; from memory).
    expectClose(solarCoordinates(Date.parse('2025-11-03T12:00:00Z')).equationOfTime_min, 16.4, 0.2);
  });
});
