import { describe, expect, it } from 'vitest';
import fc from 'fast-check';
import { parseCoordinate } from '../../app/model/coords';
import {
  COORD_FORMATS,
  DEFAULT_UNITS,
  LENGTH_UNITS,
  SPEED_UNITS,
  formatCoord,
  formatLength,
  formatSpeed,
  fromDisplayLength,
  fromDisplaySpeed,
  parseNumber,
  resolveUnits,
  toDisplayLength,
  toDisplaySpeed,
  unitLabel,
} from '../../app/ui/units';
import { expectClose, expectNearLatLng } from './helpers';

const finite = fc.double({ min: -1e9, max: 1e9, noNaN: true, noDefaultInfinity: true });

describe('length conversions', () => {
  // NIST Handbook 44, Appendix C, and the 1959 international yard and pound agreement:
  // 1 international foot = 0.3048 m exactly.
  it('one foot is exactly 0.3048 m', () => {
    expect(fromDisplayLength(1, 'ft')).toBe(0.3048);
    expect(toDisplayLength(0.3048, 'ft')).toBe(1);
    expect(toDisplayLength(304.8, 'ft')).toBeCloseTo(1000, 10);
  });

  // Same definition: 1 m = 1 / 0.3048 ft = 3.280839895013123… ft.
  it('one metre is 3.280 839 895 ft', () => {
    expectClose(toDisplayLength(1, 'ft'), 3.280839895013123, 1e-15);
  });

  it('metres pass through unchanged', () => {
    expect(toDisplayLength(123.4, 'm')).toBe(123.4);
    expect(fromDisplayLength(123.4, 'm')).toBe(123.4);
  });

  it('length round trips metres → unit → metres within 1e-12 relative', () => {
    fc.assert(
      fc.property(finite, fc.constantFrom(...LENGTH_UNITS), (m, unit) => {
        const back = fromDisplayLength(toDisplayLength(m, unit), unit);
        expect(Math.abs(back - m)).toBeLessThanOrEqual(1e-12 * Math.max(1, Math.abs(m)));
      }),
    );
  });
});

describe('speed conversions', () => {
  // BIPM SI Brochure (9th ed.), Table 8 (non-SI units): 1 knot = 1852 m / 3600 s exactly.
  it('one knot is 1852 m per hour', () => {
    expectClose(fromDisplaySpeed(1, 'kt'), 1852 / 3600, 1e-15);
    expectClose(toDisplaySpeed(1852 / 3600, 'kt'), 1, 1e-15);
    expectClose(fromDisplaySpeed(3600, 'kt') * 1, 1852, 1e-9);
  });

  // km/h: 1000 m per 3600 s (definition of the SI prefix and the hour; SI Brochure Table 8).
  it('one km/h is 1/3.6 m/s and 10 m/s is 36 km/h', () => {
    expectClose(fromDisplaySpeed(1, 'km/h'), 1000 / 3600, 1e-15);
    expectClose(toDisplaySpeed(10, 'km/h'), 36, 1e-12);
    expectClose(toDisplaySpeed(1852 / 3600, 'km/h'), 1.852, 1e-12);
  });

  it('speed round trips m/s → unit → m/s within 1e-12 relative', () => {
    fc.assert(
      fc.property(finite, fc.constantFrom(...SPEED_UNITS), (v, unit) => {
        const back = fromDisplaySpeed(toDisplaySpeed(v, unit), unit);
        expect(Math.abs(back - v)).toBeLessThanOrEqual(1e-12 * Math.max(1, Math.abs(v)));
      }),
    );
  });
});

describe('formatting', () => {
  // 110 m / 0.3048 = 360.89 ft (NIST Handbook 44 foot).
  it('formats lengths with their unit: 110 m and 361 ft', () => {
    expect(formatLength(110, 'm')).toBe('110 m');
    expect(formatLength(110, 'ft')).toBe('361 ft');
    expect(formatLength(110, 'ft', 1)).toBe('360.9 ft');
  });

  // 10 m/s = 19.438 kt (SI Brochure knot) = 36 km/h.
  it('formats speeds with their unit: 10 m/s, 19.4 kt, 36.0 km/h', () => {
    expect(formatSpeed(10, 'm/s')).toBe('10.0 m/s');
    expect(formatSpeed(10, 'kt')).toBe('19.4 kt');
    expect(formatSpeed(10, 'km/h', 0)).toBe('36 km/h');
  });

  // common practice: a value that rounds to zero is shown without a minus sign.
  it('never shows a negative zero and marks non-numbers with a dash', () => {
    expect(formatLength(-0.2, 'm')).toBe('0 m');
    expect(formatSpeed(-0.01, 'm/s')).toBe('0.0 m/s');
    expect(formatLength(-3, 'm')).toBe('-3 m');
    expect(formatLength(NaN, 'ft')).toBe('— ft');
  });

  it('labels units for field suffixes', () => {
    expect(unitLabel('length', 'ft')).toBe('ft');
    expect(unitLabel('speed', 'km/h')).toBe('km/h');
    expect(unitLabel('coords', 'mgrs')).toBe('MGRS');
  });
});

describe('formatCoord', () => {
  const p = { lat: 47.5, lon: 21.1 };

  it('writes each coordinate format', () => {
    expect(formatCoord(p, 'decimal')).toBe('47.500000, 21.100000');
    expect(formatCoord(p, 'dms')).toBe('47°30′00.0″N 21°06′00.0″E');
    expect(formatCoord(p, 'utm')).toMatch(/^34T \d{6} \d{7}$/);
    expect(formatCoord(p, 'mgrs')).toMatch(/^34T [A-Z]{2} \d{5} \d{5}$/);
  });

  it('falls back to decimal degrees where UTM and MGRS are undefined (beyond 84°N)', () => {
    expect(formatCoord({ lat: 86, lon: 10 }, 'mgrs')).toBe('86.000000, 10.000000');
    expect(formatCoord({ lat: -85, lon: 10 }, 'utm')).toBe('-85.000000, 10.000000');
  });

  // Round trip through the app's own parser; tolerance = the format's last printed digit
  // (1e-6° ≈ 0.11 m, 0.1″ ≈ 3.1 m, UTM 1 m rounding, MGRS 1 m square).
  it('every format reads back through parseCoordinate to within its resolution', () => {
    const tol: Record<string, number> = { decimal: 0.2, dms: 3.5, utm: 1.5, mgrs: 1.5 };
    fc.assert(
      fc.property(
        fc.double({ min: -79.9, max: 83.9, noNaN: true }),
        fc.double({ min: -179.9, max: 179.9, noNaN: true }),
        fc.constantFrom(...COORD_FORMATS),
        (lat, lon, unit) => {
          const text = formatCoord({ lat, lon }, unit);
          const r = parseCoordinate(text);
          expect(r.ok, text).toBe(true);
          if (r.ok) expectNearLatLng(r, { lat, lon }, tol[unit], `${unit} "${text}"`);
        },
      ),
      { numRuns: 300 },
    );
  });
});

describe('parseNumber', () => {
  it('reads plain numbers with a point, sign and surrounding spaces', () => {
    expect(parseNumber('12.5')).toEqual({ ok: true, value: 12.5 });
    expect(parseNumber('  -3 ')).toEqual({ ok: true, value: -3 });
    expect(parseNumber('+.5')).toEqual({ ok: true, value: 0.5 });
    expect(parseNumber('7.')).toEqual({ ok: true, value: 7 });
    expect(parseNumber('1e3')).toEqual({ ok: true, value: 1000 });
    expect(parseNumber('−4')).toEqual({ ok: true, value: -4 });
  });

  it('rejects empty text, words, NaN, Infinity and a decimal comma with a message', () => {
    for (const bad of [
      '',
      '   ',
      'abc',
      'NaN',
      'Infinity',
      '-Infinity',
      '1e999',
      '12 m',
      '1.2.3',
    ]) {
      const r = parseNumber(bad);
      expect(r.ok, bad).toBe(false);
      if (!r.ok) expect(r.message).toMatch(/number/);
    }
    const comma = parseNumber(' 12,5 ');
    expect(comma.ok).toBe(false);
    if (!comma.ok) expect(comma.message).toMatch(/point/);
  });

  it('reads back any finite number printed by String()', () => {
    fc.assert(
      fc.property(fc.double({ noNaN: true, noDefaultInfinity: true }), (v) => {
        const r = parseNumber(` ${String(v)} `);
        expect(r).toEqual({ ok: true, value: Object.is(v, -0) ? 0 : v });
      }),
    );
  });

  it('never throws and returns either a finite value or a message', () => {
    fc.assert(
      fc.property(fc.oneof(fc.string(), fc.string({ unit: 'binary' })), (s) => {
        const r = parseNumber(s);
        if (r.ok) expect(Number.isFinite(r.value)).toBe(true);
        else expect(r.message.length).toBeGreaterThan(0);
      }),
    );
    expect(parseNumber(undefined as unknown as string).ok).toBe(false);
  });
});

describe('unit preferences', () => {
  it('stored preferences fall back to the defaults field by field', () => {
    expect(resolveUnits(undefined)).toEqual(DEFAULT_UNITS);
    expect(resolveUnits('junk')).toEqual(DEFAULT_UNITS);
    expect(resolveUnits({ length: 'ft', speed: 'mph', coords: 'mgrs' })).toEqual({
      length: 'ft',
      speed: 'm/s',
      coords: 'mgrs',
    });
  });
});
