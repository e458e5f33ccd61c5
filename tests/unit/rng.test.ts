import { describe, expect, it } from 'vitest';
import { Rng, streamSeed } from '../../app/model/rng';

// Standard normal CDF values, Abramowitz & Stegun (1964) Table 26.1.
const PHI: [number, number][] = [
  [-3, 0.001349898],
  [-2, 0.022750132],
  [-1, 0.158655254],
  [0, 0.5],
  [0.5, 0.691462461],
  [1, 0.841344746],
  [2, 0.977249868],
  [3, 0.998650102],
];

describe('seeded random numbers', () => {
  it('the same seed gives the same stream and another seed a different one', () => {
    const a = new Rng(42);
    const b = new Rng(42);
    const c = new Rng(43);
    const sa = Array.from({ length: 50 }, () => a.normal());
    const sb = Array.from({ length: 50 }, () => b.normal());
    const sc = Array.from({ length: 50 }, () => c.normal());
    expect(sa).toEqual(sb);
    expect(sa).not.toEqual(sc);
  });

  it('uniforms lie in the open interval (0, 1) with mean 1/2 and variance 1/12', () => {
    const r = new Rng(3);
    const n = 200_000;
    let m = 0;
    let v = 0;
    for (let i = 0; i < n; i++) {
      const u = r.uniform();
      expect(u > 0 && u < 1).toBe(true);
      m += u;
      v += u * u;
    }
    m /= n;
    v = v / n - m * m;
    // Standard errors: √(1/12/n) for the mean, √(1/180/n) for the variance; allow 5 of each.
    expect(Math.abs(m - 0.5)).toBeLessThan(5 * Math.sqrt(1 / 12 / n));
    expect(Math.abs(v - 1 / 12)).toBeLessThan(5 * Math.sqrt(1 / 180 / n));
  });

  it('normals follow the standard normal distribution function (A&S Table 26.1)', () => {
    const r = new Rng(11);
    const n = 400_000;
    const below = new Array(PHI.length).fill(0);
    let m2 = 0;
    for (let i = 0; i < n; i++) {
      const x = r.normal();
      m2 += x * x;
      for (let j = 0; j < PHI.length; j++) if (x <= PHI[j][0]) below[j]++;
    }
    PHI.forEach(([, p], j) => {
      // Binomial standard error √(p(1−p)/n); 5 of them keeps false alarms below 1e-6.
      expect(Math.abs(below[j] / n - p)).toBeLessThan(5 * Math.sqrt((p * (1 - p)) / n));
    });
    // Variance 1; the standard error of the mean square is √(2/n).
    expect(Math.abs(m2 / n - 1)).toBeLessThan(5 * Math.sqrt(2 / n));
  });

  it('stream seeds differ for different labels and repeat for the same ones', () => {
    expect(streamSeed(1, 2, 3)).toBe(streamSeed(1, 2, 3));
    const seen = new Set<number>();
    for (let s = 0; s < 20; s++) for (let v = 0; v < 5; v++) seen.add(streamSeed(1, s, v));
    expect(seen.size).toBe(100);
  });
});
