import { readFileSync } from 'node:fs';
import fc from 'fast-check';
import { describe, expect, it } from 'vitest';
import { DEFAULT_SURFACE_EXPONENT } from '../../app/core/constants';
import type { PlanFile } from '../../app/core/plan';
import { DEFAULTS, resolvePlan } from '../../app/core/plan-defaults';
import schema from '../../app/core/plan.schema.json';
import { validatePlan, type PlanIssue } from '../../app/core/validate';
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
  // contract: docs/plan-format.md (descentRate_mps > 0 and ≤ 30)
  it('an out-of-range descent rate names the path and the full range', () => {
    const p = plan();
    p.variants[0].descentRate_mps = 0;
    expect(messagesOf(p)).toEqual(['variants[0].descentRate_mps must be > 0 and ≤ 30']);
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
    ['requiredPHit', 1.5, 'requiredPHit must be between 0 and 1'],
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
    });
    expect(p.uncertainty).toEqual({
      windSpeed_mps: 0,
      windCorrelation_m: 300,
      descentRate_pct: 0,
      releasePosition_m: 0,
      heading_deg: 0,
      releaseTiming_s: 0,
    });
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
      const again = validatePlan(JSON.parse(JSON.stringify(first.ok && first.plan)));
      expect(again.ok && again.plan).toEqual(first.ok && first.plan);
    }
  });
});

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
    release: fc.record({ lat: num(-90, 90), lon: num(-180, 180), agl: num(1, 4000) }),
    layers: fc.uniqueArray(
      fc.record({ altitude_m: num(-500, 10000), fromDeg: num(0, 360), speed_mps: num(0, 100) }),
      { selector: (l) => l.altitude_m, maxLength: 8 },
    ),
    variants: fc.uniqueArray(
      fc.record({
        id,
        guidance: fc.constantFrom('passive', 'fixed-heading', 'homing'),
        descentRate_mps: num(0.01, 30),
        glideAngle_deg: num(0.01, 89.99),
        controlTime_s: num(0, 3600),
        entryLoss_m: num(0, 10000),
        referenceMass_kg: num(0.001, 1000),
        payloadMass_kg: num(0.001, 1000),
        maxWind_mps: num(0, 100),
      }),
      { selector: (v) => v.id, minLength: 1, maxLength: 4 },
    ),
    sites: fc.uniqueArray(
      fc.record({
        id,
        lat: num(-90, 90),
        lon: num(-180, 180),
        below: fc.option(num(0, 100)),
        tolerance_m: num(0.01, 10000),
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
    pHit: num(0, 1),
  })
  .map((g) => ({
    format: 'seedfall-plan',
    version: 1,
    time: g.time.toISOString(),
    groundElevation_m: g.ground,
    winds: { reference: 'MSL', layers: g.layers },
    release: { lat: g.release.lat, lon: g.release.lon, altitude_m: g.release.agl },
    variants: g.variants,
    sites: g.sites.map(({ below, pin, ...s }) => ({
      ...s,
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
        const again = validatePlan(JSON.parse(JSON.stringify(r.ok && r.plan)));
        expect(again.ok && again.plan).toEqual(r.ok && r.plan);
      }),
    );
  });
});
