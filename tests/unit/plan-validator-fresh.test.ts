import Ajv from 'ajv';
import addFormats from 'ajv-formats';
import { readFileSync } from 'node:fs';
import { describe, expect, it } from 'vitest';
import checkSchema from '../../app/plan/plan-validator.generated';
import schema from '../../app/plan/plan.schema.json';
import demo from '../../data/demo-plan.json';
import {
  AJV_OPTIONS,
  GEN_COMMAND,
  MODULE_PATH,
  SCHEMA_PATH,
  validatorModuleSource,
} from '../../scripts/gen-validator';

// The reference: ajv itself, compiling the same schema at run time with the same options
// (ajv's standalone mode is documented to produce the same validation function it compiles).
const runtime = (() => {
  const ajv = new Ajv({ ...AJV_OPTIONS });
  addFormats(ajv, ['date-time']);
  return ajv.compile(schema);
})();

const minimal = () => ({
  format: 'seedfall-plan',
  version: 1,
  release: { lat: 47.49, lon: 21.08, altitude_m: 100 },
  variants: [{ id: 'p', guidance: 'passive', descentRate_mps: 3 }],
  sites: [{ id: 's', lat: 47.49, lon: 21.081 }],
});

/** Inputs that reach every kind of keyword the schema uses (ranges, lengths, pattern, format…). */
const CASES: [string, unknown][] = [
  ['the demo plan', demo],
  ['a minimal plan', minimal()],
  ['not an object', 'plan'],
  ['null', null],
  ['an empty object', {}],
  [
    'wrong types, ranges, unknown fields and a bad enum',
    {
      ...minimal(),
      version: 2,
      extra: true,
      release: { lat: 95, lon: '21', altitude_m: -1000, reference: 'AMSL' },
      variants: [{ id: '', guidance: 'glider', descentRate_mps: 0, glideAngle_deg: 91 }],
      monteCarlo: { samples: 1.5, seed: -1 },
    },
  ],
  // A leading space breaks the id pattern; 65 characters breaks maxLength.
  [
    'ids against the pattern and length',
    {
      ...minimal(),
      sites: [
        { id: ' s', lat: 0, lon: 0 },
        { id: 'x'.repeat(65), lat: 0, lon: 0 },
      ],
    },
  ],
  // maxLength counts code points (JSON Schema 2020-12 §6.3.1): 64 astral characters are 128
  // UTF-16 units and still a valid id; 65 are not.
  [
    'astral characters counted as one',
    { ...minimal(), sites: [{ id: '🪂'.repeat(64), lat: 0, lon: 0 }] },
  ],
  [
    'astral characters over the limit',
    { ...minimal(), sites: [{ id: '🪂'.repeat(65), lat: 0, lon: 0 }] },
  ],
  // RFC 3339 §5.6 date-time: a zone is required; 2026-02-30 does not exist.
  ['a date-time with a zone', { ...minimal(), time: '2026-12-01T09:30:00+01:00' }],
  ['a date-time without a zone', { ...minimal(), time: '2026-12-01T09:30:00' }],
  ['a day that does not exist', { ...minimal(), time: '2026-02-30T09:30:00Z' }],
  [
    'payload ids',
    { ...minimal(), sites: [{ id: '<img src=x onerror="window.__pwned=1">', lat: 0, lon: 0 }] },
  ],
];

describe('the precompiled plan validator', () => {
  it('is the module the generator writes from the current schema', () => {
    const fresh = validatorModuleSource(JSON.parse(readFileSync(SCHEMA_PATH, 'utf8')) as object);
    const committed = readFileSync(MODULE_PATH, 'utf8');
    expect(
      committed === fresh,
      `${MODULE_PATH} is stale against plan.schema.json (or ajv changed): run \`${GEN_COMMAND}\``,
    ).toBe(true);
  });

  it('holds no run-time code compilation and no CommonJS require', () => {
    const committed = readFileSync(MODULE_PATH, 'utf8');
    expect(committed).not.toMatch(/new Function|\beval\(|\brequire\(/);
  });

  it.each(CASES)('gives the same verdict and errors as ajv compiled at run time: %s', (_, data) => {
    const ok = checkSchema(data);
    expect(ok).toBe(runtime(data));
    expect(checkSchema.errors ?? null).toEqual(runtime.errors ?? null);
  });

  it('checks lengths in code points and dates by the calendar, as ajv-formats does', () => {
    const verdicts = Object.fromEntries(CASES.map(([name, data]) => [name, checkSchema(data)]));
    expect(verdicts['the demo plan']).toBe(true);
    expect(verdicts['astral characters counted as one']).toBe(true);
    expect(verdicts['astral characters over the limit']).toBe(false);
    expect(verdicts['a date-time with a zone']).toBe(true);
    expect(verdicts['a date-time without a zone']).toBe(false);
    expect(verdicts['a day that does not exist']).toBe(false);
  });
});
