import { describe, expect, it } from 'vitest';
import { validatePlan } from '../../app/plan/validate';
import { makeField } from '../support/make-field';
import { NOW } from './helpers';

describe('makeField, the N-site plan generator', () => {
  it('gives a valid plan (the plan schema) with n distinct sites inside the demo area', () => {
    const file = makeField(1000, 4);
    const v = validatePlan(file, { now: NOW });
    expect(v.ok).toBe(true);
    expect(file.sites).toHaveLength(1000);
    expect(new Set(file.sites.map((s) => s.id)).size).toBe(1000);
    // Demo sites lie within 47.4909…47.4934 N, 21.0767…21.0847 E; grown by half on each side.
    for (const s of file.sites) {
      expect(s.lat).toBeGreaterThan(47.4897);
      expect(s.lat).toBeLessThan(47.4946);
      expect(s.lon).toBeGreaterThan(21.0727);
      expect(s.lon).toBeLessThan(21.0887);
    }
  });

  it('is deterministic: the same n and seed give the same file, another seed another', () => {
    expect(JSON.stringify(makeField(50, 9))).toBe(JSON.stringify(makeField(50, 9)));
    expect(JSON.stringify(makeField(50, 9))).not.toBe(JSON.stringify(makeField(50, 10)));
  });

  it('refuses a count outside 0…1000, the plan format limit', () => {
    expect(() => makeField(1001, 1)).toThrow(/0 to 1000/);
    expect(() => makeField(-1, 1)).toThrow(/0 to 1000/);
    expect(makeField(0, 1).sites).toEqual([]);
  });
});
