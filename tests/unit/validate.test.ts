import { readFileSync } from 'node:fs';
import fc from 'fast-check';
import { describe, expect, it } from 'vitest';
import { DEFAULT_SURFACE_EXPONENT } from '../../app/model/constants';
import type { PlanFile } from '../../app/plan/plan';
import { DEFAULTS, resolvePlan } from '../../app/plan/plan-defaults';
import schema from '../../app/plan/plan.schema.json';
import { allowedRange, validatePlan, type PlanIssue } from '../../app/plan/validate';
import { destination } from '../../app/model/geodesy';
import { naiveFlight } from '../../app/model/naive-integrator';
import { WindProfile } from '../../app/model/wind';
import demo from '../../data/demo-plan.json';
import catalogue from '../../data/variants.json';
import windExample from '../../data/wind-example.json';

const NOW = new Date('2026-12-01T08:00:00Z');
const plan = (): Record<string, any> => structuredClone(demo); // eslint-disable-line @typescript-eslint/no-explicit-any
const minimal = (): PlanFile => ({
  format: 'seedfall-plan',
  version: 1,
  release: { lat: 47.49, lon: 21.08, altitude_m: 100 },
  variants: [{ id: 'p', guidance: 'passive', descentRate_mps: 3 }],
  sites: [{ id: 's', lat: 47.49, lon: 21.081 }],
});

function errorsOf(raw: unknown): PlanIssue[] {
  const r = validatePlan(raw, { now: NOW });
  return r.ok ? [] : r.errors;
}
const messagesOf = (raw: unknown): string[] => errorsOf(raw).map((e) => e.message);

/** True when a house path (variants[0].id) names a node of the schema. */
function schemaHasPath(path: string): boolean {
  type Node = { properties?: Record<string, Node>; items?: Node; $ref?: string };
  const defs = schema.definitions as unknown as Record<string, Node>;
  const deref = (n: Node): Node => (n.$ref ? defs[n.$ref.split('/').pop()!] : n);
  let node: Node | undefined = schema as unknown as Node;
  for (const m of path.matchAll(/([^.[\]]+)|\[(\d+)\]/g)) {
    if (!node) return false;
    node = deref(node);
    node = m[2] !== undefined ? node.items : node.properties?.[m[1]];
  }
  return node !== undefined;
}

function expectHouseForm(errors: PlanIssue[]): void {
  for (const e of errors) {
    expect(e.message.startsWith(`${e.path || 'plan'} `), e.message).toBe(true);
    expect(schemaHasPath(e.path), e.path).toBe(true);
  }
}

describe('data files', () => {
  it('the demo plan validates with no errors and no warnings', () => {
    const r = validatePlan(demo);
    expect(r.ok ? r.warnings : r.errors).toEqual([]);
  });

  it('the variant catalogue is the demo plan’s variant list, one per guidance mode', () => {
    expect(catalogue).toEqual(demo.variants);
    expect(new Set(catalogue.map((v) => v.guidance))).toEqual(
      new Set(['passive', 'fixed-heading', 'homing']),
    );
  });

  it('the example in docs/plan-format.md validates with no warnings', () => {
    const doc = readFileSync(new URL('../../docs/plan-format.md', import.meta.url), 'utf8');
    // The complete example is the json block that is a whole plan (others show single fields).
    const blocks = [...doc.matchAll(/```json\n([\s\S]*?)```/g)].map((m) => m[1]);
    const whole = blocks.filter((b) => b.includes('"format": "seedfall-plan"'));
    expect(whole.length).toBe(1);
    const example = JSON.parse(whole[0]);
    const r = validatePlan(example);
    expect(r.ok ? r.warnings : r.errors).toEqual([]);
  });

  it('the example wind profile validates as a plan’s winds', () => {
    expect(errorsOf({ ...plan(), winds: windExample })).toEqual([]);
  });
});

describe('house-form messages', () => {
  // contract: docs/plan-format.md (descentRate_mps 0.05 to 30)
  it('an out-of-range descent rate names the path and the full range', () => {
    const p = plan();
    p.variants[0].descentRate_mps = 0;
    expect(messagesOf(p)).toEqual(['variants[0].descentRate_mps must be between 0.05 and 30']);
  });

  // WGS 84 coordinate ranges
  it('a latitude beyond 90 says "between -90 and 90"', () => {
    const p = plan();
    p.sites[3].lat = 91;
    expect(messagesOf(p)).toEqual(['sites[3].lat must be between -90 and 90']);
  });

  // WGS 84 coordinate ranges
  it('a latitude given as text says it must be a number in range', () => {
    const p = plan();
    p.release.lat = '47.5';
    expect(messagesOf(p)).toEqual(['release.lat must be a number between -90 and 90']);
  });

  it('a missing required field says "is required"', () => {
    const p = plan();
    delete p.release;
    delete p.variants[1].guidance;
    expect(messagesOf(p)).toEqual(['release is required', 'variants[1].guidance is required']);
  });

  it('an unknown field is named, with the likely intended field', () => {
    const p = plan();
    p.winds.layers[1].sped_mps = 4;
    p.colour = 'red';
    expect(messagesOf(p)).toEqual([
      'plan has an unknown field "colour"',
      'winds.layers[1] has an unknown field "sped_mps" (did you mean "speed_mps"?)',
    ]);
  });

  it('a site pinning an unknown variant names the id and the known ids', () => {
    const p = plan();
    p.sites[2].variant = 'hover-x';
    expect(messagesOf(p)).toEqual([
      'sites[2].variant "hover-x" is not a variant id (known: plain-drifter, vane-steer, beacon-seek)',
    ]);
  });

  // contract: docs/plan-format.md (format, version, guidance, samples, descentRate_pct, id)
  it.each([
    ['format', 'other', 'format must be "seedfall-plan"'],
    ['version', 2, 'version must be 1'],
    ['requiredPHit', 1.5, 'requiredPHit must be between 0.01 and 1'],
  ])('top-level %s = %j is reported', (key, value, message) => {
    expect(messagesOf({ ...plan(), [key]: value })).toEqual([message]);
  });

  it('enums, integers, exclusive bounds and empty ids read as sentences', () => {
    const p = plan();
    p.variants[0].guidance = 'glider';
    p.variants[1].id = '';
    p.monteCarlo.samples = 0.5;
    p.uncertainty.descentRate_pct = 50;
    p.release.reference = 'QFE';
    expect(messagesOf(p)).toEqual([
      'release.reference must be "AGL" or "MSL"',
      'variants[0].guidance must be one of "passive", "fixed-heading" or "homing"',
      'variants[1].id must not be empty',
      'uncertainty.descentRate_pct must be ≥ 0 and < 50',
      'monteCarlo.samples must be an integer between 1 and 100000',
    ]);
  });

  // RFC 3339 §5.6: date-time needs a time-offset
  it('a time without a zone is rejected with an example', () => {
    expect(messagesOf({ ...plan(), time: '2026-12-01T09:30:00' })).toEqual([
      'time must be an ISO 8601 date-time with a time zone, e.g. "2026-12-01T09:30:00+01:00"',
    ]);
  });

  it('input that is not an object is reported, never thrown', () => {
    for (const raw of [null, undefined, 42, 'plan', [], [demo]]) {
      expect(messagesOf(raw)).toEqual(['plan must be an object']);
    }
  });
});

describe('cross-field checks', () => {
  it('duplicate ids, steering fields, masses, release height, wind altitudes and time', () => {
    const p = plan();
    p.variants[2].id = 'plain-drifter';
    p.sites[5].id = 's01';
    delete p.variants[1].glideAngle_deg;
    delete p.variants[1].controlTime_s;
    delete p.variants[0].referenceMass_kg;
    p.sites[7].elevation_m = 250;
    p.winds.layers[3].altitude_m = 50;
    // RFC 3339 §5.6 allows second 60 (leap second); ECMAScript Date.parse cannot read it.
    p.time = '2026-12-31T23:59:60Z';
    expect(errorsOf(p)).toEqual([
      {
        path: 'variants[0].referenceMass_kg',
        message: 'variants[0].referenceMass_kg is required when payloadMass_kg is given',
      },
      {
        path: 'variants[1].glideAngle_deg',
        message:
          'variants[1].glideAngle_deg is required for a steered variant (guidance "fixed-heading")',
      },
      {
        path: 'variants[1].controlTime_s',
        message:
          'variants[1].controlTime_s is required for a steered variant (guidance "fixed-heading")',
      },
      {
        path: 'variants[2].id',
        message: 'variants[2].id "plain-drifter" is already used by variants[0]',
      },
      { path: 'sites[5].id', message: 'sites[5].id "s01" is already used by sites[0]' },
      // The site pinned to beacon-seek now points at a variant id that no longer exists.
      {
        path: 'sites[6].variant',
        message:
          'sites[6].variant "beacon-seek" is not a variant id (known: plain-drifter, vane-steer)',
      },
      {
        path: 'release.altitude_m',
        message:
          'release.altitude_m is 110 m AGL (199 m MSL), not above the ground at sites[7] "Alder Carr" (250 m MSL)',
      },
      {
        path: 'winds.layers[3].altitude_m',
        message: 'winds.layers[3].altitude_m repeats the altitude of winds.layers[1] (50 m)',
      },
      {
        path: 'time',
        message: 'time "2026-12-31T23:59:60Z" cannot be read as a date and time',
      },
    ]);
  });

  it('a steered variant needs a glide angle below 90 degrees', () => {
    const p = plan();
    p.variants[2].glideAngle_deg = 90;
    expect(messagesOf(p)).toEqual([
      'variants[2].glideAngle_deg must be < 90 for a steered variant (guidance "homing")',
    ]);
  });

  it('schema errors and cross-field errors are listed together', () => {
    const p = plan();
    p.sites[0].lat = -100;
    p.sites[1].variant = 'nope';
    p.carrier.trackDeg = 400;
    expect(errorsOf(p).map((e) => e.path)).toEqual([
      'carrier.trackDeg',
      'sites[0].lat',
      'sites[1].variant',
    ]);
  });

  it('an incomplete plan gets warnings, not errors', () => {
    const r = validatePlan({ ...minimal(), sites: [] });
    expect(r.ok && r.warnings).toEqual([
      'time is not given; the current time is used',
      'winds.layers is empty; calm air is assumed',
      'sites is empty; there is nothing to plan',
    ]);
  });
});

/** The demo plan with one value set at a dotted path (numbers index arrays). */
function demoWith(path: string, value: unknown): ReturnType<typeof plan> {
  const p = plan();
  const keys = path.match(/[^.[\]]+/g)!;
  let node = p;
  for (const k of keys.slice(0, -1)) node = node[k];
  node[keys[keys.length - 1]] = value;
  return p;
}

describe('ranges a practitioner recognises (docs/plan-format.md, "Ranges")', () => {
  // contract: docs/plan-format.md range table; each bound is checked on both sides.
  it.each([
    ['variants[0].descentRate_mps', 0.05, 0.049, 'must be between 0.05 and 30'],
    [
      'variants[0].descentRate_mps',
      30 / Math.sqrt(0.048 / 0.045),
      30.01,
      'must be between 0.05 and 30',
    ],
    ['variants[1].glideAngle_deg', 1, 0.99, 'must be between 1 and 90'],
    ['carrier.groundSpeed_mps', 0, 1e-320, 'must be 0 or between 0.5 and 100'],
    ['carrier.groundSpeed_mps', 0.5, 0.49, 'must be 0 or between 0.5 and 100'],
    ['carrier.groundSpeed_mps', 100, 100.1, 'must be 0 or between 0.5 and 100'],
    ['variants[0].throwTime_s', 10, 10.01, 'must be between 0 and 10'],
    ['sites[0].tolerance_m', 0.1, 0.099, 'must be between 0.1 and 10000'],
    ['uncertainty.windCorrelation_m', 1, 0.99, 'must be between 1 and 100000'],
    ['uncertainty.releasePosition_m', 1000, 1000.1, 'must be between 0 and 1000'],
    ['uncertainty.releaseTiming_s', 10, 10.1, 'must be between 0 and 10'],
    ['uncertainty.gust_mps', 0, -1, 'must be between 0 and 10'],
    ['uncertainty.gust_mps', 10, 10.01, 'must be between 0 and 10'],
    ['uncertainty.gustTime_s', 0.1, 0.099, 'must be between 0.1 and 3600'],
    ['uncertainty.gustTime_s', 3600, 3600.1, 'must be between 0.1 and 3600'],
    ['uncertainty.verticalAir_mps', 0, -0.01, 'must be between 0 and 5'],
    ['uncertainty.verticalAir_mps', 5, 5.01, 'must be between 0 and 5'],
    ['requiredPHit', 0.01, 0.0099, 'must be between 0.01 and 1'],
    ['requiredPHit', 1, 1.01, 'must be between 0.01 and 1'],
    ['safety.ceiling_m', 1, 0.99, 'must be between 1 and 10000'],
  ])('%s: %j is accepted, %j is refused with the range', (path, ok, bad, rest) => {
    expect(errorsOf(demoWith(path, ok))).toEqual([]);
    expect(errorsOf(demoWith(path, bad))).toEqual([{ path, message: `${path} ${rest}` }]);
  });

  // The inputs that crashed or printed NaN before these ranges: each is now one clear message.
  it.each([
    ['variants[0].descentRate_mps', 1e-320, 'must be between 0.05 and 30'],
    ['carrier.groundSpeed_mps', 1e-320, 'must be 0 or between 0.5 and 100'],
    ['variants[0].referenceMass_kg', 1e-320, 'must be between 0.001 and 100'],
    ['variants[1].glideAngle_deg', 1e-320, 'must be between 1 and 90'],
    ['requiredPHit', 0, 'must be between 0.01 and 1'],
  ])('%s = %j is refused with the range', (path, bad, rest) => {
    expect(errorsOf(demoWith(path, bad))).toEqual([{ path, message: `${path} ${rest}` }]);
  });

  // Issue: negative or absurd σ, a correlation time of 0, an unknown class. Each is refused by
  // its path with its range or the allowed values; nothing else is reported, the file given is
  // left as it was, and once those fields are put right every other value comes through.
  it('bad turbulence fields name the field and its range, and nothing else is lost', () => {
    const bad = plan();
    Object.assign(bad.uncertainty, {
      turbulence: 'stormy',
      gust_mps: 50,
      gustTime_s: 0,
      verticalAir_mps: 9,
    });
    const before = structuredClone(bad);
    expect(messagesOf(bad)).toEqual([
      'uncertainty.turbulence must be one of "none", "light", "moderate", "severe" or "auto"',
      'uncertainty.gust_mps must be between 0 and 10',
      'uncertainty.gustTime_s must be between 0.1 and 3600',
      'uncertainty.verticalAir_mps must be between 0 and 5',
    ]);
    expect(bad).toEqual(before);
    expect(messagesOf(demoWith('uncertainty.gust_mps', -1))).toEqual([
      'uncertainty.gust_mps must be between 0 and 10',
    ]);
    expect(messagesOf(demoWith('uncertainty.gust_mps', 'NaN'))).toEqual([
      'uncertainty.gust_mps must be a number between 0 and 10',
    ]);
    expect(allowedRange('uncertainty.gustTime_s')).toBe('a number between 0.1 and 3600');
    expect(allowedRange('uncertainty.verticalAir_mps')).toBe('a number between 0 and 5');
    // Put right: the plan validates and resolves to the demo's values plus the four fields.
    Object.assign(bad.uncertainty, {
      turbulence: 'light',
      gust_mps: 1.5,
      gustTime_s: 4,
      verticalAir_mps: 0.5,
    });
    const r = validatePlan(bad, { now: NOW });
    expect(r.ok ? r.warnings : r.errors).toEqual([]);
    const resolved = resolvePlan(bad as PlanFile, { now: NOW });
    const plain = resolvePlan(plan() as PlanFile, { now: NOW });
    expect(resolved.uncertainty).toEqual({
      ...plain.uncertainty,
      turbulence: 'light',
      gust_mps: 1.5,
      gustTime_s: 4,
      verticalAir_mps: 0.5,
    });
    expect({ ...resolved, uncertainty: null }).toEqual({ ...plain, uncertainty: null });
  });

  it('a carrier speed given as text names the range with its gap; form hints say the same', () => {
    expect(messagesOf(demoWith('carrier.groundSpeed_mps', '3'))).toEqual([
      'carrier.groundSpeed_mps must be a number, 0 or between 0.5 and 100',
    ]);
    expect(allowedRange('carrier.groundSpeed_mps')).toBe('a number, 0 or between 0.5 and 100');
    expect(allowedRange('variants[0].descentRate_mps')).toBe('a number between 0.05 and 30');
  });

  // contract: docs/plan-format.md (masses 0.001 to 100 kg)
  it('masses: 1 g and 100 kg are accepted, less or more is refused', () => {
    const masses = (m0: number, m: number) => {
      const p = plan();
      Object.assign(p.variants[0], { referenceMass_kg: m0, payloadMass_kg: m });
      return errorsOf(p);
    };
    expect(masses(0.001, 0.001)).toEqual([]);
    expect(masses(100, 100)).toEqual([]);
    expect(masses(0.00099, 0.00099).map((e) => e.message)).toEqual([
      'variants[0].referenceMass_kg must be between 0.001 and 100',
      'variants[0].payloadMass_kg must be between 0.001 and 100',
    ]);
    expect(masses(100.1, 100.1).map((e) => e.path)).toEqual([
      'variants[0].referenceMass_kg',
      'variants[0].payloadMass_kg',
    ]);
  });

  // contract: docs/plan-format.md (payload 0.25 to 4 times the reference mass)
  it('the mass ratio is held between 1/4 and 4 with a message naming both fields', () => {
    // referenceMass_kg of variants[0] is 0.045 kg: 0.01125 and 0.18 kg are the bounds.
    const payload = (m: number) =>
      errorsOf(demoWith('variants[0].payloadMass_kg', m)).map((e) => e.message);
    expect(payload(0.01125)).toEqual([]);
    expect(payload(0.18)).toEqual([]);
    expect(payload(0.0108)).toEqual([
      'variants[0].payloadMass_kg is 0.0108 kg, 0.24 times referenceMass_kg (0.045 kg); it must be between 0.25 and 4 times referenceMass_kg',
    ]);
    expect(payload(0.1845)).toEqual([
      'variants[0].payloadMass_kg is 0.1845 kg, 4.1 times referenceMass_kg (0.045 kg); it must be between 0.25 and 4 times referenceMass_kg',
    ]);
  });

  // contract: docs/plan-format.md (the mass-scaled descent rate stays within 0.05 to 30 m/s)
  it('the mass-scaled descent rate is held in the descent range', () => {
    const p = plan();
    Object.assign(p.variants[0], {
      descentRate_mps: 0.1,
      referenceMass_kg: 1,
      payloadMass_kg: 0.25,
    });
    expect(errorsOf(p)).toEqual([]); // 0.1 × √0.25 = 0.05
    p.variants[0].descentRate_mps = 0.09;
    expect(errorsOf(p)).toEqual([
      {
        path: 'variants[0].descentRate_mps',
        message:
          'variants[0].descentRate_mps 0.09 scaled by √(payloadMass_kg / referenceMass_kg) is 0.045 m/s; the scaled rate must be between 0.05 and 30',
      },
    ]);
  });

  // RFC 7946 §3.1.1: a position is [longitude, latitude]; WGS 84 latitude is within ±90.
  it('no-drop zone positions are [lon, lat]: latitude beyond ±90 is refused, naming the vertex', () => {
    const zone = (lat: number, lon = 21.08) => {
      const p = plan();
      const ring = p.safety.noDropZones[0].geometry.coordinates[0];
      ring[1] = [lon, lat];
      return errorsOf(p);
    };
    expect(zone(90)).toEqual([]);
    expect(zone(-90)).toEqual([]);
    const at = 'safety.noDropZones[0].geometry.coordinates[0][1][1]';
    expect(zone(100)).toEqual([
      {
        path: at,
        message: `${at} (latitude) is 100, must be between -90 and 90; positions are [lon, lat]`,
      },
    ]);
    expect(zone(-90.01)).toHaveLength(1);
    expect(zone(47.49, 180.01)).toEqual([
      {
        path: 'safety.noDropZones[0].geometry.coordinates[0][1][0]',
        message: 'safety.noDropZones[0].geometry.coordinates[0][1][0] must be between -180 and 180',
      },
    ]);
    // Several bad vertices in one zone: one message, counting the rest.
    const p = plan();
    for (const pos of p.safety.noDropZones[0].geometry.coordinates[0]) pos[1] = 95;
    expect(messagesOf(p)).toEqual([
      'safety.noDropZones[0].geometry.coordinates[0][0][1] (latitude) is 95, must be between -90 and 90; positions are [lon, lat]; 4 more positions of this zone too',
    ]);
  });

  it('nesting deeper than 32 levels is refused with the path, before anything recursive runs', () => {
    // A zone's properties sit at depth 4 (safety, noDropZones, [0], properties).
    const nested = (levels: number) => {
      let inner: unknown = 'x';
      for (let i = 0; i < levels; i++) inner = { a: inner };
      const p = plan();
      p.safety.noDropZones[0].properties = { name: 'Dyke road', deep: inner };
      return errorsOf(p);
    };
    expect(nested(27)).toEqual([]); // deepest object at depth 4 + 27 = 31
    const errs = nested(28);
    expect(errs).toHaveLength(1);
    expect(errs[0].path).toBe(`safety.noDropZones[0].properties.deep${'.a'.repeat(27)}`);
    expect(errs[0].message).toBe(
      `${errs[0].path} is nested more than 32 levels deep; a plan needs at most 8`,
    );
    // Deep enough to overflow a recursive walk (structuredClone overflowed at about 10,000).
    const huge = nested(200_000);
    expect(huge).toHaveLength(1);
    expect(huge[0].message).toContain('is nested more than 32 levels deep');
  });
});

describe('limits across fields (docs/plan-format.md, "Limits across fields")', () => {
  // Work bound (docs/plan-format.md): sites × variants × samples ≤ 20 million flights.
  it('a plan asking for more than 20 million Monte Carlo flights is refused naming monteCarlo.samples', () => {
    // 100 sites × the demo's variants: the bound falls inside the schema's sample range.
    const withSamples = (samples: number) => {
      const p = plan();
      p.sites = Array.from({ length: 100 }, (_, i) => ({
        ...demo.sites[i % demo.sites.length],
        id: `s${i}`,
      }));
      p.monteCarlo = { ...(p.monteCarlo ?? {}), samples };
      return p;
    };
    const most = Math.floor(20_000_000 / (100 * demo.variants.length));
    expect(most).toBeLessThan(100_000);
    expect(errorsOf(withSamples(most))).toEqual([]);
    const over = errorsOf(withSamples(most + 1));
    expect(over).toHaveLength(1);
    expect(over[0].path).toBe('monteCarlo.samples');
    expect(over[0].message).toContain(`lower the samples to at most ${most}`);
    expectHouseForm(over);
    // 1,000 sites × 100 variants × 100,000 samples, every count at its maximum: refused at once.
    const big = plan();
    big.sites = Array.from({ length: 1000 }, (_, i) => ({ ...demo.sites[0], id: `s${i}` }));
    big.variants = Array.from({ length: 100 }, (_, i) => ({ ...demo.variants[0], id: `v${i}` }));
    big.monteCarlo = { samples: 100_000, seed: 1 };
    for (const s of big.sites) delete s.variant;
    const e = errorsOf(big);
    expect(e.map((x) => x.path)).toEqual(['monteCarlo.samples']);
  });

  it('long unknown field names get no suggestion, short typos do', () => {
    const p = plan();
    p.releese = 1;
    p['x'.repeat(1000)] = 1;
    const m = messagesOf(p);
    expect(m).toContain('plan has an unknown field "releese" (did you mean "release"?)');
    expect(m).toContain(`plan has an unknown field "${'x'.repeat(1000)}"`);
  });

  it('a site farther than 50 km from the release point is refused', () => {
    const at = (km: number) => {
      const p = plan();
      Object.assign(p.sites[0], destination(p.release, 90, km * 1000));
      return errorsOf(p);
    };
    expect(at(49.9)).toEqual([]);
    expect(at(50.1)).toEqual([
      {
        path: 'sites[0]',
        message:
          'sites[0] "Reed Margin North" is 50.1 km from the release point (release.lat, release.lon); sites must be within 50.0 km of it',
      },
    ]);
  });

  // Independent reference: naiveFlight (10 ms time stepping, no shared tables); in a wind that is
  // the same at every height the landing is throw + wind × fall time (common practice).
  it('a variant drifting farther than 50 km is refused; just inside is accepted', () => {
    const base = (speed: number): PlanFile => ({
      ...minimal(),
      release: { lat: 47.49, lon: 21.08, altitude_m: 3000 },
      winds: {
        layers: [
          { altitude_m: 0, fromDeg: 270, speed_mps: speed },
          { altitude_m: 10000, fromDeg: 270, speed_mps: speed },
        ],
      },
      variants: [{ id: 'slow', guidance: 'passive', descentRate_mps: 0.5 }],
    });
    const flight = naiveFlight({
      top_m: 3000,
      bottom_m: 0,
      descentRateSL_mps: 0.5,
      entryLoss_m: 0,
      isaOffset_K: 0,
      wind: new WindProfile(base(10).winds!.layers!),
      carrier: { x: 0, y: 0 },
      dt_s: 0.05,
    });
    const limitSpeed = (10 * 50_000) / Math.hypot(flight.x, flight.y);
    expect(errorsOf(base(limitSpeed * 0.99))).toEqual([]);
    const over = errorsOf(base(limitSpeed * 1.01));
    expect(over.map((e) => e.path)).toEqual(['variants[0]']);
    expect(over[0].message).toMatch(
      /^variants\[0\] "slow" would land up to 50\.[45] km from its release: \d+ s fall from release\.altitude_m at descentRate_mps 0\.5 drifts 50\.\d km in winds\.layers, throw 0\.0 km; at most 50\.0 km is supported$/,
    );
  });

  it('a steering reach beyond 50 km names the glide and control fields', () => {
    const p = plan();
    Object.assign(p.variants[1], { glideAngle_deg: 1, controlTime_s: 3600 });
    p.release.altitude_m = 2000;
    const errs = errorsOf(p);
    expect(errs.map((e) => e.path)).toEqual(['variants[1]']);
    expect(errs[0].message).toContain('steering reach');
    expect(errs[0].message).toContain('(glideAngle_deg, controlTime_s)');
  });
});

describe('resolvePlan', () => {
  // contract: docs/plan-format.md (defaults)
  it('fills every documented default', () => {
    const p = resolvePlan(minimal(), { now: NOW });
    expect(p.name).toBe('Untitled plan');
    expect(p.time).toBe('2026-12-01T08:00:00.000Z');
    expect(p.groundElevation_m).toBe(0);
    expect(p.atmosphere).toEqual({ isaOffset_K: 0 });
    expect(p.winds).toEqual({ reference: 'AGL', layers: [], surfaceExponent: 1 / 7 });
    expect(DEFAULT_SURFACE_EXPONENT).toBe(1 / 7); // common practice
    expect(p.release.reference).toBe('AGL');
    expect(p.carrier).toEqual({ groundSpeed_mps: 0, trackDeg: 0 });
    expect(p.variants[0]).toEqual({
      ...minimal().variants[0],
      name: 'p',
      glideAngle_deg: 90,
      controlTime_s: 0,
      entryLoss_m: 0,
    });
    expect(p.sites[0]).toEqual({
      ...minimal().sites[0],
      name: 's',
      elevation_m: 0,
      tolerance_m: 10,
      // the file gave no elevation: an elevation model may set it (docs/model.md §18)
      elevationDefaulted: true,
    });
    expect(p.uncertainty).toEqual({
      windSpeed_mps: 0,
      windCorrelation_m: 300,
      descentRate_pct: 0,
      releasePosition_m: 0,
      heading_deg: 0,
      releaseTiming_s: 0,
      turbulence: 'auto',
    });
    // Gust and vertical air left out stay out: absent means "modelled" (docs/plan-format.md).
    for (const k of ['gust_mps', 'gustTime_s', 'verticalAir_mps']) {
      expect(Object.keys(p.uncertainty)).not.toContain(k);
    }
    expect(p.monteCarlo).toEqual({ samples: 2000, seed: 1 });
    expect(p.requiredPHit).toBe(0.9);
    expect(DEFAULTS.uncertainty).toEqual(p.uncertainty);
  });

  it('a site without an elevation takes the plan’s ground elevation', () => {
    const p = resolvePlan({ ...minimal(), groundElevation_m: 89 });
    expect(p.sites[0].elevation_m).toBe(89);
  });

  it('sorts wind layers by altitude and never mutates the input', () => {
    const file = { ...minimal(), winds: { layers: [...demo.winds.layers].reverse() } };
    const before = structuredClone(file);
    const p = resolvePlan(file, { now: NOW });
    expect(file).toEqual(before);
    expect(p.winds.layers).toEqual(demo.winds.layers);
    p.winds.layers[0].speed_mps = 99;
    p.variants[0].name = 'changed';
    expect(file).toEqual(before);
  });

  it('plan → JSON → plan gives the same resolved plan', () => {
    for (const file of [demo, minimal()]) {
      const first = validatePlan(file, { now: NOW });
      expect(first.ok).toBe(true);
      const again = validatePlan(asFile(first.ok && first.plan));
      expect(again.ok && again.plan).toEqual(asTyped(first.ok && first.plan));
    }
  });
  it('marks only the sites whose elevation the file left out', () => {
    const file = minimal();
    file.sites.push({ id: 't', lat: 47.5, lon: 21, elevation_m: 3 });
    const r = validatePlan(file, { now: NOW });
    expect(r.ok && r.plan.sites.map((s) => s.elevationDefaulted)).toEqual([true, undefined]);
  });
});

/**
 * A resolved plan written back as a file: JSON, without the resolver's marks of defaulted site
 * elevations (not file fields). Resolving it again types every elevation.
 */
function asFile(plan: unknown): unknown {
  const copy = JSON.parse(JSON.stringify(plan)) as { sites?: Record<string, unknown>[] };
  for (const s of copy.sites ?? []) delete s.elevationDefaulted;
  return copy;
}
/** The resolved plan as it resolves again from asFile: every elevation typed. */
function asTyped(plan: unknown): unknown {
  return asFile(plan);
}

/** Every leaf path of a JSON value, as key lists. */
function leaves(x: unknown, at: (string | number)[] = []): (string | number)[][] {
  if (typeof x !== 'object' || x === null) return [at];
  return Object.entries(x).flatMap(([k, v]) => leaves(v, [...at, Array.isArray(x) ? +k : k]));
}

// `+ 0` turns -0 into 0, which is what JSON gives back.
const num = (min: number, max: number) => fc.double({ min, max, noNaN: true }).map((x) => x + 0);
const id = fc.stringMatching(/^[A-Za-z0-9][A-Za-z0-9._-]{0,20}$/);

// contract: docs/plan-format.md; WGS 84 coordinate ranges for lat/lon
const validPlan = fc
  .record({
    ground: num(-100, 5000),
    // Inside the limits across fields too: sites within 0.3° (≤ 47 km) of the release point, and
    // falls short and slow enough that drift + reach stays under 50 km (a fall of ≤ 1000 m at
    // ≥ 1 m/s in ≤ 20 m/s winds drifts ≤ 20 km; a 5° glide reaches ≤ 11.5 km).
    release: fc.record({ lat: num(-89.5, 89.5), lon: num(-179.5, 179.5), agl: num(1, 1000) }),
    layers: fc.uniqueArray(
      fc.record({ altitude_m: num(-500, 10000), fromDeg: num(0, 360), speed_mps: num(0, 20) }),
      { selector: (l) => l.altitude_m, maxLength: 8 },
    ),
    variants: fc.uniqueArray(
      fc.record({
        id,
        guidance: fc.constantFrom('passive', 'fixed-heading', 'homing'),
        descentRate_mps: num(2, 15),
        glideAngle_deg: num(5, 89.99),
        controlTime_s: num(0, 3600),
        entryLoss_m: num(0, 10000),
        referenceMass_kg: num(0.0041, 25),
        massRatio: num(0.26, 3.9),
        maxWind_mps: num(0, 100),
      }),
      { selector: (v) => v.id, minLength: 1, maxLength: 4 },
    ),
    sites: fc.uniqueArray(
      fc.record({
        id,
        dLat: num(-0.3, 0.3),
        dLon: num(-0.3, 0.3),
        below: fc.option(num(0, 100)),
        tolerance_m: num(0.1, 10000),
        pin: fc.option(fc.nat()),
      }),
      { selector: (s) => s.id, maxLength: 6 },
    ),
    time: fc.date({
      min: new Date('1990-01-01'),
      max: new Date('2100-01-01'),
      noInvalidDate: true,
    }),
    samples: fc.integer({ min: 1, max: 100000 }),
    seed: fc.integer({ min: 0, max: 4294967295 }),
    pct: num(0, 49.99),
    pHit: num(0.01, 1),
  })
  .map((g) => ({
    format: 'seedfall-plan',
    version: 1,
    time: g.time.toISOString(),
    groundElevation_m: g.ground,
    winds: { reference: 'MSL', layers: g.layers },
    release: { lat: g.release.lat, lon: g.release.lon, altitude_m: g.release.agl },
    variants: g.variants.map(({ massRatio, ...v }) => ({
      ...v,
      payloadMass_kg: v.referenceMass_kg * massRatio,
    })),
    sites: g.sites.map(({ below, pin, dLat, dLon, ...s }) => ({
      ...s,
      lat: g.release.lat + dLat,
      lon: g.release.lon + dLon,
      ...(below === null ? {} : { elevation_m: g.ground - below }),
      ...(pin === null ? {} : { variant: g.variants[pin % g.variants.length].id }),
    })),
    uncertainty: { descentRate_pct: g.pct },
    monteCarlo: { samples: g.samples, seed: g.seed },
    requiredPHit: g.pHit,
  }));

describe('properties (fast-check)', () => {
  it('validatePlan never throws and reports house-form paths for any value', () => {
    fc.assert(
      fc.property(fc.anything(), (raw) => {
        expectHouseForm(errorsOf(raw));
      }),
    );
  });

  it('plan-shaped objects with arbitrary field values get house-form errors', () => {
    const keys = [...Object.keys(schema.properties), 'extra'];
    fc.assert(
      fc.property(fc.dictionary(fc.constantFrom(...keys), fc.anything()), (raw) => {
        expectHouseForm(errorsOf(raw));
      }),
    );
  });

  it('replacing any leaf of the demo plan with random JSON never throws', () => {
    const paths = leaves(demo);
    fc.assert(
      fc.property(fc.nat(), fc.jsonValue(), (i, value) => {
        const p = plan();
        const path = paths[i % paths.length];
        let node = p;
        for (const k of path.slice(0, -1)) node = node[k];
        node[path[path.length - 1]] = value;
        const r = validatePlan(p, { now: NOW });
        if (!r.ok) expectHouseForm(r.errors);
      }),
    );
  });

  it('plans generated within the documented ranges always validate and round-trip', () => {
    fc.assert(
      fc.property(validPlan, (file) => {
        const r = validatePlan(file);
        expect(r.ok ? [] : r.errors).toEqual([]);
        const again = validatePlan(asFile(r.ok && r.plan));
        expect(again.ok && again.plan).toEqual(asTyped(r.ok && r.plan));
      }),
    );
  });
});
