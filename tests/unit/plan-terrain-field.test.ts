import { describe, expect, it } from 'vitest';
import { planFingerprint, validatePlan } from '../../app/plan';
import demo from '../../data/demo-plan.json';

const withTerrain = (terrain: unknown) => validatePlan({ ...structuredClone(demo), terrain });
const messages = (terrain: unknown): string[] => {
  const v = withTerrain(terrain);
  return v.ok ? [] : v.errors.map((e) => e.message);
};

describe('the plan file names its elevation model', () => {
  it('keeps terrain.file through resolvePlan unchanged', () => {
    for (const file of ['dem.tif', 'models/valley 10m.TIFF', '../shared/grid.asc']) {
      const v = withTerrain({ file });
      expect(v.ok).toBe(true);
      if (v.ok) expect(v.plan.terrain).toEqual({ file });
    }
  });

  it('leaves a plan without it as it was: no field, the same fingerprint as before the field existed', () => {
    const v = validatePlan(structuredClone(demo));
    expect(v.ok).toBe(true);
    if (!v.ok) return;
    expect('terrain' in v.plan).toBe(false);
    const t = withTerrain({ file: 'dem.tif' });
    if (!t.ok) throw new Error('terrain plan');
    // The field is part of the plan: naming another model voids a sign-off.
    expect(planFingerprint(t.plan)).not.toBe(planFingerprint(v.plan));
    const rest = { ...t.plan };
    delete rest.terrain;
    expect(planFingerprint(rest)).toBe(planFingerprint(v.plan));
  });

  it('refuses other file types, control characters, empty and overlong names, with the field path', () => {
    const kind = 'terrain.file must name a .tif, .tiff or .asc file, with no control characters';
    expect(messages({ file: 'dem.png' })).toEqual([kind]);
    expect(messages({ file: 'dem.tif.txt' })).toEqual([kind]);
    expect(messages({ file: 'a\u0000.tif' })).toEqual([kind]);
    expect(messages({ file: 'a\n.asc' })).toEqual([kind]);
    expect(messages({ file: '' })).toEqual(['terrain.file must not be empty']);
    expect(messages({ file: 'x'.repeat(997) + '.tif' })).toEqual([
      'terrain.file must be at most 1000 characters long',
    ]);
    expect(messages({ file: 7 })).toEqual(['terrain.file must be a string']);
    expect(messages({})).toEqual(['terrain.file is required']);
    expect(messages({ file: 'a.tif', band: 2 })).toEqual(['terrain has an unknown field "band"']);
  });
});
