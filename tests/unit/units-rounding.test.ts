// One display rounding per quantity and unit (DECIMALS in app/ui/units.ts), checked against
// values worked by hand with the conversion factors of NIST SP 811 (2008), Appendix B.8/B.9:
// foot = 0.3048 m exactly; knot = 1 nautical mile (1852 m exactly) per hour = 1852/3600 m/s;
// kilometre per hour = 1000/3600 m/s.
import { describe, expect, it } from 'vitest';
import fc from 'fast-check';
import {
  DECIMALS,
  DEFAULT_UNITS,
  LENGTH_UNITS,
  SPEED_UNITS,
  decimalsOf,
  fieldText,
  formatQuantity,
  fromDisplay,
  parseNumber,
  quantityUnit,
  toDisplay,
  type Quantity,
  type UnitPrefs,
} from '../../app/ui/units';

const FT = 0.3048; // NIST SP 811 B.8: foot = 3.048 E−01 m (exact)
const KT = 1852 / 3600; // NIST SP 811 B.8: knot = 5.144 444 E−01 m/s (1852 m per hour, exact)

const M: UnitPrefs = { ...DEFAULT_UNITS, length: 'm', speed: 'm/s' };
const FT_KT: UnitPrefs = { ...DEFAULT_UNITS, length: 'ft', speed: 'kt' };
const KMH: UnitPrefs = { ...DEFAULT_UNITS, speed: 'km/h' };

describe('the rounding rule of each quantity in each unit (read-only text)', () => {
  // Worked by hand: 10 / 0.3048 = 32.808 4 ft; 1.7 / 0.3048 = 5.577 4 ft.
  it('a horizontal distance shows a tenth: 10 m is "32.8 ft", a CEP of 1.7 m is "5.6 ft"', () => {
    expect(formatQuantity(10, 'distance', FT_KT)).toBe('32.8 ft');
    expect(formatQuantity(1.7, 'distance', FT_KT)).toBe('5.6 ft');
    expect(formatQuantity(10, 'distance', M)).toBe('10.0 m');
    expect(formatQuantity(10 * FT, 'distance', FT_KT)).toBe('10.0 ft');
  });

  // 300 / 0.3048 = 984.252 ft; 110 / 0.3048 = 360.892 ft; 3000 ft = 914.4 m.
  it('a height or altitude shows whole units: 300 m is "984 ft", 110 m is "361 ft"', () => {
    expect(formatQuantity(300, 'height', FT_KT)).toBe('984 ft');
    expect(formatQuantity(110, 'height', FT_KT)).toBe('361 ft');
    expect(formatQuantity(3000 * FT, 'height', M)).toBe('914 m');
    expect(formatQuantity(89.4, 'height', M)).toBe('89 m');
  });

  // 0.7 × 3600 / 1852 = 1.360 69 kt; 4 kt = 4 × 1852 / 3600 = 2.057 78 m/s;
  // 13 m/s = 25.270 0 kt = 46.8 km/h; 0.7 m/s = 2.52 km/h.
  it('a speed shows a tenth: 0.7 m/s is "1.4 kt", 4 kt is "2.1 m/s"', () => {
    expect(formatQuantity(0.7, 'speed', FT_KT)).toBe('1.4 kt');
    expect(formatQuantity(4 * KT, 'speed', M)).toBe('2.1 m/s');
    expect(formatQuantity(13, 'speed', FT_KT)).toBe('25.3 kt');
    expect(formatQuantity(13, 'speed', KMH)).toBe('46.8 km/h');
    expect(formatQuantity(0.7, 'speed', KMH)).toBe('2.5 km/h');
  });

  // common practice: the resolution each is set or read to in the field.
  it('quantities with one unit round by their own rule', () => {
    expect(formatQuantity(0.3, 'time', M)).toBe('0.3 s');
    expect(formatQuantity(22, 'time', M)).toBe('22.0 s');
    expect(formatQuantity(42, 'angle', M)).toBe('42.0°');
    expect(formatQuantity(249.6, 'bearing', M)).toBe('250°');
    expect(formatQuantity(47.49287414, 'coordinate', M)).toBe('47.492874°');
    expect(formatQuantity(0.0478, 'mass', M)).toBe('0.048 kg');
    // ½ m v² of 0.074 kg at 3 m/s = 0.333 J
    expect(formatQuantity(0.5 * 0.074 * 3 * 3, 'energy', M)).toBe('0.33 J');
    expect(formatQuantity(5, 'percent', M)).toBe('5.0 %');
    expect(formatQuantity(0.9, 'probability', M)).toBe('0.90');
    expect(formatQuantity(-12, 'temperature', M)).toBe('-12.0 K');
    expect(formatQuantity(0.143, 'ratio', M)).toBe('0.143');
    expect(formatQuantity(2000, 'count', M)).toBe('2000');
    expect(formatQuantity(14, 'cost', M)).toBe('14.00');
  });

  // common practice: a value that rounds to zero has no sign; a missing value is a dash.
  it('never shows a negative zero and marks a missing number with a dash', () => {
    expect(formatQuantity(-0.04, 'speed', M)).toBe('0.0 m/s');
    expect(formatQuantity(-0.1, 'height', FT_KT)).toBe('0 ft');
    expect(formatQuantity(NaN, 'height', FT_KT)).toBe('— ft');
    expect(formatQuantity(NaN, 'probability', M)).toBe('—');
  });

  it('has a rule for every unit of every quantity and shows each in the preferred unit', () => {
    for (const q of Object.keys(DECIMALS) as Quantity[]) {
      for (const [unit, d] of Object.entries(DECIMALS[q])) {
        expect(Number.isInteger(d) && d >= 0 && d <= 6, `${q} in ${unit}`).toBe(true);
      }
    }
    expect(Object.keys(DECIMALS.distance).sort()).toEqual([...LENGTH_UNITS].sort());
    expect(Object.keys(DECIMALS.height).sort()).toEqual([...LENGTH_UNITS].sort());
    expect(Object.keys(DECIMALS.speed).sort()).toEqual([...SPEED_UNITS].sort());
    expect(quantityUnit('height', FT_KT)).toBe('ft');
    expect(quantityUnit('speed', KMH)).toBe('km/h');
    expect(quantityUnit('mass', FT_KT)).toBe('kg');
    expect(decimalsOf('height', 'ft')).toBe(0);
  });
});

describe('what a number field shows', () => {
  // The four texts the rule exists to prevent: 10 m and 300 m in feet, 0.7 m/s in knots, and a
  // speed typed as 4 kt shown back in m/s.
  it('rounds a converted value: "32.8", "984", "1.4" and "2.1", never "32.8084" or "2.05778"', () => {
    expect(fieldText(10, 'distance', FT_KT)).toBe('32.8');
    expect(fieldText(300, 'height', FT_KT)).toBe('984');
    expect(fieldText(0.7, 'speed', FT_KT)).toBe('1.4');
    expect(fieldText(4 * KT, 'speed', M)).toBe('2.1');
    expect(fieldText(110, 'height', FT_KT)).toBe('361');
    expect(fieldText(13, 'speed', FT_KT)).toBe('25.3');
  });

  it('drops trailing zeros and a sign on zero', () => {
    expect(fieldText(10 * FT, 'distance', FT_KT)).toBe('10');
    expect(fieldText(-0.0004, 'speed', M)).toBe('0');
    expect(fieldText(-0, 'height', M)).toBe('0');
  });

  // common practice: what a person typed or a file gave is shown as it is, not rounded away.
  it('shows a short stored value as it is: 89.4 m ground, 914.4 m (3000 ft), 3.81 m', () => {
    expect(fieldText(89.4, 'height', M)).toBe('89.4');
    expect(fieldText(3000 * FT, 'height', M)).toBe('914.4');
    expect(fieldText(12.5 * FT, 'height', M)).toBe('3.81');
    expect(fieldText(47.4928741, 'coordinate', M)).toBe('47.4928741');
    expect(fieldText(2.95, 'speed', M)).toBe('2.95');
  });

  it('shows back exactly what was typed in the field’s unit (up to the rule’s decimals)', () => {
    const q = fc.constantFrom<Quantity>('distance', 'height', 'speed');
    const prefs = fc.record({
      length: fc.constantFrom(...LENGTH_UNITS),
      speed: fc.constantFrom(...SPEED_UNITS),
      coords: fc.constant(DEFAULT_UNITS.coords),
    });
    fc.assert(
      fc.property(q, prefs, fc.integer({ min: -1e7, max: 1e8 }), (q, p, n) => {
        const d = decimalsOf(q, quantityUnit(q, p));
        const typed = String(n / 10 ** d);
        const r = parseNumber(typed);
        expect(r.ok).toBe(true);
        if (!r.ok) return;
        const stored = fromDisplay(r.value, q, p);
        expect(fieldText(stored, q, p)).toBe(String(r.value));
      }),
      { numRuns: 500 },
    );
  });

  it('is within half a last digit of the exact value in the shown unit', () => {
    fc.assert(
      fc.property(
        fc.constantFrom<Quantity>('distance', 'height', 'speed'),
        fc.constantFrom(M, FT_KT, KMH),
        fc.double({ min: -1e5, max: 1e5, noNaN: true }),
        (q, p, si) => {
          const shown = Number(fieldText(si, q, p));
          const d = decimalsOf(q, quantityUnit(q, p));
          const exact = toDisplay(si, q, p);
          expect(Math.abs(shown - exact)).toBeLessThanOrEqual(
            0.5 * 10 ** -d + 1e-9 * Math.abs(exact),
          );
        },
      ),
      { numRuns: 500 },
    );
  });
});
