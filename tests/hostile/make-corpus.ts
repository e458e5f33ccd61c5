/**
 * The bad-input corpus: hostile and extreme inputs for the CLI (plan files) and the core importers
 * (sites CSV/GeoJSON/KML, winds-aloft text, sounding CSV, surface readings).
 *
 *   npx tsx tests/hostile/make-corpus.ts     writes the small cases to tests/hostile/cases/
 *
 * Plan cases are mutations of data/demo-plan.json; numeric ranges are read from
 * app/plan/plan.schema.json when this runs, so the corpus follows the documented ranges. Large
 * cases (bounded-read, size-limit and speed probes) are made by `largeCases()` at test time.
 */
import { writeFileSync, mkdirSync, rmSync } from 'node:fs';
import { dirname, join, resolve } from 'node:path';
import { fileURLToPath } from 'node:url';
import demoJson from '../../data/demo-plan.json';
import schemaJson from '../../app/plan/plan.schema.json';
import type { CaseMeta, CliRun } from './judge';

type Json = Record<string, unknown>;
type Node = Json;

/** A case with its content (bytes or text); `content: null` = a path given as is (devices). */
export interface HostileCase extends CaseMeta {
  content: string | Uint8Array | null;
}

export const CASES_DIR = join(dirname(fileURLToPath(import.meta.url)), 'cases');

const defs = (schemaJson as unknown as { definitions: Record<string, Node> }).definitions;
const deref = (n: Node): Node =>
  typeof n.$ref === 'string' ? deref(defs[n.$ref.split('/').pop()!]) : n;
const isRecord = (x: unknown): x is Json =>
  typeof x === 'object' && x !== null && !Array.isArray(x);
const clone = <T>(x: T): T => JSON.parse(JSON.stringify(x)) as T;
const child = (p: string, k: string) => (p ? `${p}.${k}` : k);
const slug = (s: string) =>
  s
    .replace(/\[(\d+)\]/g, '-$1')
    .replace(/[^A-Za-z0-9_-]+/g, '-')
    .replace(/^-|-$/g, '');

/**
 * The demo plan with every optional section filled (sounding, throw time, checklist, sign-off) so
 * every schema field has a place to be mutated; 200 Monte Carlo samples keep each run short.
 */
export function basePlan(): Json {
  const p = clone(demoJson) as Json;
  (p.atmosphere as Json).sounding = {
    reference: 'AGL',
    surfacePressure_hPa: 1003,
    levels: [
      { altitude_m: 0, temperature_K: 276 },
      { altitude_m: 500, temperature_K: 273 },
      { altitude_m: 1000, temperature_K: 270 },
    ],
  };
  (p.variants as Json[])[0].throwTime_s = 0.4;
  const safety = p.safety as Json;
  safety.checklist = [
    {
      id: 'c1',
      text: 'Landing area walked and clear',
      state: 'done',
      who: 'Crew A',
      when: '09:10',
      note: 'dry',
    },
  ];
  safety.signoff = {
    who: 'Crew lead',
    when: '2026-12-01T09:15:00+01:00',
    reason: 'checked on site',
    planHash: '0000',
    covers: ['wind-limit'],
  };
  p.monteCarlo = { samples: 200, seed: 1 };
  return p;
}

/** Sets (or with `undefined` deletes) the value at a house path. */
function setAt(obj: Json, path: string, value: unknown): void {
  const keys = path.match(/[^.[\]]+/g) ?? [];
  let cur = obj as Json;
  for (const k of keys.slice(0, -1)) cur = cur[k] as Json;
  const last = keys[keys.length - 1];
  if (value === undefined) delete cur[last];
  else cur[last] = value;
}

interface Leaf {
  path: string;
  node: Node;
}

/** Indices of an array to mutate: every variant (each guidance mode flies differently), both lon and lat of a position, else the first. */
function indices(path: string, n: Node, arr: unknown[]): number[] {
  if (path === 'variants') return arr.map((_, i) => i);
  const it = deref((n.items ?? {}) as Node);
  if (it.type === 'number' || it.type === 'integer') return arr.map((_, i) => i).slice(0, 2);
  return arr.length ? [0] : [];
}

/** Every number and string field of the schema that has a value in `base`. */
function leaves(base: unknown, node: Node, path = '', out: Leaf[] = []): Leaf[] {
  const n = deref(node);
  if (n.type === 'number' || n.type === 'integer' || n.type === 'string')
    out.push({ path, node: n });
  else if (n.type === 'object' && isRecord(base)) {
    for (const [k, sub] of Object.entries((n.properties ?? {}) as Record<string, Node>)) {
      if (k in base) leaves(base[k], sub, child(path, k), out);
    }
  } else if (n.type === 'array' && Array.isArray(base)) {
    for (const i of indices(path, n, base)) {
      const items = Array.isArray(n.items) ? (n.items[i] as Node) : (n.items as Node);
      if (items) leaves(base[i], items, `${path}[${i}]`, out);
    }
  }
  return out;
}

/** Numbers for one field: the classic extremes and the documented bounds with a step past each. */
function numericValues(n: Node): [string, unknown][] {
  const int = n.type === 'integer';
  const step = (b: number) => (int ? 1 : Math.max(Math.abs(b), 1) * 1e-9);
  const out: [string, unknown][] = [
    ['zero', 0],
    ['negative', -1],
    ['denormal', 1e-320],
    ['huge', 1e308],
    ['nan-string', 'NaN'],
    ['null', null],
  ];
  const lo = (n.minimum ?? n.exclusiveMinimum) as number | undefined;
  const hi = (n.maximum ?? n.exclusiveMaximum) as number | undefined;
  if (lo !== undefined) {
    const excl = n.exclusiveMinimum !== undefined;
    out.push(['min', excl ? lo + step(lo) : lo], ['below-min', excl ? lo : lo - step(lo)]);
  }
  if (hi !== undefined) {
    const excl = n.exclusiveMaximum !== undefined;
    out.push(['max', excl ? hi - step(hi) : hi], ['above-max', excl ? hi : hi + step(hi)]);
  }
  const gap = n.not as Node | undefined;
  if (gap && typeof gap.exclusiveMinimum === 'number' && typeof gap.exclusiveMaximum === 'number') {
    out.push(['excluded-gap', (gap.exclusiveMinimum + gap.exclusiveMaximum) / 2]);
  }
  const seen = new Set<string>();
  return out.filter(([, v]) => {
    const k = JSON.stringify(v) + typeof v;
    if (seen.has(k)) return false;
    seen.add(k);
    return true;
  });
}

// OWASP XSS Filter Evasion Cheat Sheet; OWASP CSV Injection; Unicode TR #36 (bidi spoofing).
const STRING_VALUES: [string, unknown, string][] = [
  ['html-img', '<img src=x onerror=alert(1)>', 'OWASP XSS Filter Evasion Cheat Sheet'],
  ['script-break', '"><script>alert(1)</script>', 'OWASP XSS Filter Evasion Cheat Sheet'],
  ['svg-onload', '</title><svg onload=alert(1)>', 'OWASP XSS Filter Evasion Cheat Sheet'],
  ['cdata-break', ']]><x>&amp;<!--', 'XML 1.0 §2.7 (CDATA end) // common practice'],
  ['formula', '=HYPERLINK("http://example.invalid","x")', 'OWASP CSV Injection'],
  ['formula-at', '@SUM(1+1)*cmd', 'OWASP CSV Injection'],
  ['nul', 'a\u0000b', 'common practice (control characters)'],
  ['ansi-escape', '\u001b[31mred\u001b[0m', 'ECMA-48 control sequences // common practice'],
  ['rtl-override', '\u202Egnp.exe', 'Unicode TR #36 §2.1 (bidirectional spoofing)'],
  ['len-64', 'x'.repeat(64), 'plan.schema.json id maxLength'],
  ['len-65', 'x'.repeat(65), 'plan.schema.json id maxLength'],
  ['len-10k', 'y'.repeat(10_000), 'common practice (nothing grows without bound)'],
  ['empty', '', 'plan.schema.json minLength'],
  ['padded', ' a ', 'plan.schema.json id pattern'],
  ['number', 5, 'common practice (wrong type)'],
];

const EXTRA_RUNS: CliRun[] = ['plan-json'];

function planCase(
  id: string,
  plan: unknown,
  meta: Omit<CaseMeta, 'id' | 'file' | 'target'>,
  ext = 'json',
): HostileCase {
  return {
    id,
    file: `plan/${id}.${ext}`,
    target: 'cli',
    runs: EXTRA_RUNS,
    ...meta,
    content: typeof plan === 'string' ? plan : JSON.stringify(plan),
  };
}

/** Renames a variant and every site pin to it, so a payload id stays a valid plan. */
function renameVariant(p: Json, i: number, id: unknown): void {
  const v = (p.variants as Json[])[i];
  const old = v.id;
  v.id = id;
  for (const s of p.sites as Json[]) if (s.variant === old) s.variant = id;
}

/**
 * Optional fields whose absence has a meaning of its own (absent = modelled gust and vertical
 * air), so the base plan leaves them out: each is mutated alone on the base, the others absent.
 */
const OPTIONAL_FIELDS: Record<string, number> = {
  'uncertainty.gust_mps': 1,
  'uncertainty.gustTime_s': 5,
  'uncertainty.verticalAir_mps': 0.5,
};

/** Numeric and string mutations of every field of the filled-in demo plan. */
function fieldCases(): HostileCase[] {
  const base = basePlan();
  const filled = clone(base);
  for (const [path, value] of Object.entries(OPTIONAL_FIELDS)) setAt(filled, path, value);
  const out: HostileCase[] = [];
  for (const leaf of leaves(filled, schemaJson as Node)) {
    const isNum = leaf.node.type === 'number' || leaf.node.type === 'integer';
    const values: [string, unknown, string][] = isNum
      ? numericValues(leaf.node).map(([k, v]) => [k, v, 'plan.schema.json range'])
      : STRING_VALUES;
    for (const [label, value, source] of values) {
      const p = clone(base);
      if (/^variants\[\d+\]\.id$/.test(leaf.path))
        renameVariant(p, Number(/\d+/.exec(leaf.path)![0]), value);
      else setAt(p, leaf.path, value);
      const id = `${isNum ? 'num' : 'str'}-${slug(leaf.path)}-${label}`;
      const shown =
        typeof value === 'string' && value.length > 40
          ? `${value.length} characters`
          : JSON.stringify(value);
      out.push(
        planCase(id, p, {
          category: isNum ? 'ranges' : 'script',
          probes: `${leaf.path} = ${shown}`,
          source,
          path: leaf.path,
          ...(typeof value === 'string' && /[<>"&]/.test(value) ? { payload: value } : {}),
          // Extremes that may be valid also go through the text table and, where they steer the
          // results, the brief (NaN, Infinity or undefined must never be printed).
          ...(isNum && /^(min|max|denormal|huge)$/.test(label)
            ? {
                runs: [
                  'plan-json',
                  'plan-text',
                  ...(/^(min|max)$/.test(label) &&
                  /^(variants|carrier|requiredPHit|uncertainty|release)/.test(leaf.path)
                    ? (['brief'] as const)
                    : []),
                ] as CliRun[],
              }
            : {}),
          // The crash-prone tiny values named in the issue run as real processes.
          ...(label === 'denormal' &&
          /descentRate_mps|groundSpeed_mps|referenceMass_kg|glideAngle_deg/.test(leaf.path)
            ? { separate: true as const }
            : {}),
        }),
      );
    }
  }
  return out;
}

/** Each required field left out, at every level. */
function missingCases(): HostileCase[] {
  const base = basePlan();
  const out: HostileCase[] = [];
  const visit = (v: unknown, node: Node, path: string) => {
    const n = deref(node);
    if (n.type === 'object' && isRecord(v)) {
      for (const r of (n.required as string[] | undefined) ?? []) {
        const p = clone(base);
        const at = child(path, r);
        setAt(p, at, undefined);
        out.push(
          planCase(`missing-${slug(at)}`, p, {
            category: 'ranges',
            probes: `required field ${at} left out`,
            source: 'plan.schema.json required',
            path: at,
          }),
        );
      }
      for (const [k, sub] of Object.entries((n.properties ?? {}) as Record<string, Node>)) {
        if (k in v) visit(v[k], sub, child(path, k));
      }
    } else if (n.type === 'array' && Array.isArray(v) && v.length && isRecord(n.items)) {
      visit(v[0], n.items as Node, `${path}[0]`);
    }
  };
  visit(base, schemaJson as Node, '');
  return out;
}

function nest(depth: number): unknown {
  let x: unknown = 'bottom';
  for (let i = 0; i < depth; i++) x = { a: x };
  return x;
}

/** Hand-made plan cases: wrong types, cross-field rules, prototype keys, nesting, zone latitude. */
function shapeCases(): HostileCase[] {
  const b = basePlan;
  const out: HostileCase[] = [];
  const add = (id: string, plan: unknown, probes: string, extra: Partial<CaseMeta> = {}) =>
    out.push(
      planCase(id, plan, { category: 'ranges', probes, source: 'common practice', ...extra }),
    );
  add('type-plan-array', [b()], 'the plan is an array');
  add('type-plan-string', JSON.stringify('seedfall-plan'), 'the plan is a JSON string');
  add('type-plan-null', 'null', 'the plan is null');
  add('type-plan-number', '1e308', 'the plan is a number');
  add(
    'type-sites-object',
    { ...b(), sites: { s01: (b().sites as Json[])[0] } },
    'sites is an object, not an array',
    { path: 'sites' },
  );
  add('type-variants-string', { ...b(), variants: 'plain-drifter' }, 'variants is a string', {
    path: 'variants',
  });
  add('type-release-array', { ...b(), release: [47.49, 21.08, 110] }, 'release is an array', {
    path: 'release',
  });
  add(
    'type-bool-lat',
    (() => {
      const p = b();
      setAt(p, 'release.lat', true);
      return p;
    })(),
    'release.lat is a boolean',
    { path: 'release.lat' },
  );
  add('type-format-wrong', { ...b(), format: 'other-plan' }, 'format is not seedfall-plan', {
    path: 'format',
  });
  add('type-version-2', { ...b(), version: 2 }, 'version 2', { path: 'version' });
  add(
    'enum-guidance',
    (() => {
      const p = b();
      setAt(p, 'variants[0].guidance', 'rocket');
      return p;
    })(),
    'guidance outside its enum',
    { path: 'variants[0].guidance' },
  );
  add(
    'enum-turbulence',
    (() => {
      const p = b();
      setAt(p, 'uncertainty.turbulence', 'stormy');
      return p;
    })(),
    'turbulence class outside its enum',
    { path: 'uncertainty.turbulence' },
  );
  add(
    'turbulence-severe',
    (() => {
      const p = b();
      setAt(p, 'uncertainty.turbulence', 'severe');
      return p;
    })(),
    'the strongest turbulence class (wind at 20 ft of 45 kt) on every variant',
    {
      path: 'uncertainty.turbulence',
      source: 'MIL-F-8785C low-altitude model (severe: W20 = 45 kt)',
    },
  );
  add(
    'turbulence-every-maximum',
    (() => {
      const p = b();
      setAt(p, 'uncertainty.turbulence', 'severe');
      setAt(p, 'uncertainty.gust_mps', 10);
      setAt(p, 'uncertainty.gustTime_s', 3600);
      setAt(p, 'uncertainty.verticalAir_mps', 5);
      return p;
    })(),
    'gust, correlation time and vertical air all at their documented maximum',
    { path: 'uncertainty.verticalAir_mps', source: 'plan.schema.json range' },
  );
  add(
    'unknown-field-proto',
    JSON.stringify(b()).replace(/^\{/, '{"__proto__":{"polluted":true},'),
    'a "__proto__" key (prototype pollution)',
    {
      source: 'OWASP Prototype Pollution Prevention Cheat Sheet',
    },
  );
  add(
    'unknown-field-constructor',
    { ...b(), constructor: { prototype: { x: 1 } } },
    'a "constructor" key',
    {
      source: 'OWASP Prototype Pollution Prevention Cheat Sheet',
    },
  );
  add('unknown-field-typo', { ...b(), requiredPhit: 0.5 }, 'a misspelt field name');
  add(
    'dup-site-id',
    (() => {
      const p = b();
      (p.sites as Json[])[1].id = 's01';
      return p;
    })(),
    'two sites with the id s01',
    {
      reject: true,
      path: 'sites[1].id',
    },
  );
  add(
    'dup-variant-id',
    (() => {
      const p = b();
      (p.variants as Json[])[1].id = 'plain-drifter';
      return p;
    })(),
    'two variants with one id',
    {
      reject: true,
      path: 'variants[1].id',
    },
  );
  add(
    'unknown-pin',
    (() => {
      const p = b();
      (p.sites as Json[])[0].variant = 'no-such';
      return p;
    })(),
    'a site pinned to a variant that does not exist',
    {
      reject: true,
      path: 'sites[0].variant',
    },
  );
  add(
    'steered-no-glide',
    (() => {
      const p = b();
      delete (p.variants as Json[])[1].glideAngle_deg;
      return p;
    })(),
    'a fixed-heading variant without a glide angle',
    {
      reject: true,
      path: 'variants[1].glideAngle_deg',
    },
  );
  add(
    'steered-glide-90',
    (() => {
      const p = b();
      (p.variants as Json[])[2].glideAngle_deg = 90;
      return p;
    })(),
    'a homing variant with a glide angle of 90°',
    {
      reject: true,
      path: 'variants[2].glideAngle_deg',
    },
  );
  add(
    'release-below-site',
    (() => {
      const p = b();
      setAt(p, 'release.altitude_m', -100);
      return p;
    })(),
    'release altitude below the ground of the sites',
    {
      reject: true,
      path: 'release.altitude_m',
    },
  );
  add(
    'payload-without-reference',
    (() => {
      const p = b();
      delete (p.variants as Json[])[0].referenceMass_kg;
      return p;
    })(),
    'payloadMass_kg without referenceMass_kg',
    {
      reject: true,
      path: 'variants[0].referenceMass_kg',
    },
  );
  add(
    'layers-repeat-altitude',
    (() => {
      const p = b();
      ((p.winds as Json).layers as Json[])[1].altitude_m = 10;
      return p;
    })(),
    'two wind layers at one altitude',
    {
      reject: true,
      path: 'winds.layers[1].altitude_m',
    },
  );
  add(
    'zone-lat-100',
    (() => {
      const p = b();
      setAt(p, 'safety.noDropZones[0].geometry.coordinates[0][0][1]', 100);
      return p;
    })(),
    'a no-drop zone vertex at latitude 100 ([lon, lat] order)',
    {
      reject: true,
      path: 'safety.noDropZones[0].geometry.coordinates[0][0][1]',
      source: 'RFC 7946 §3.1.1 (position order and latitude range)',
    },
  );
  add(
    'zone-open-ring',
    (() => {
      const p = b();
      setAt(p, 'safety.noDropZones[0].geometry.coordinates[0][4]', [21.07, 47.48]);
      return p;
    })(),
    'a zone ring whose last position differs from its first',
    {
      source: 'RFC 7946 §3.1.6 (linear ring is closed)',
    },
  );
  add(
    'zone-props-depth-90',
    (() => {
      const p = b();
      setAt(p, 'safety.noDropZones[0].properties', nest(90) as Json);
      return p;
    })(),
    'zone properties nested 90 deep',
  );
  add(
    'zone-props-depth-10000',
    (() => {
      const p = b();
      return JSON.stringify(p).replace(
        '"properties":{"name":"Dyke road"}',
        `"properties":${'{"a":'.repeat(10000)}1${'}'.repeat(10000)}`,
      );
    })(),
    'zone properties nested 10,000 deep',
  );
  add(
    'number-1e400',
    JSON.stringify(b()).replace('"speed_mps":3.2', '"speed_mps":1e400'),
    'a number literal beyond double range (parses as Infinity)',
    {
      source: 'RFC 8259 §6 (number range is implementation-defined)',
      path: 'winds.layers[0].speed_mps',
    },
  );
  add(
    'number-minus-zero',
    JSON.stringify(b()).replace('"trackDeg":250', '"trackDeg":-0'),
    'carrier.trackDeg = -0',
    { path: 'carrier.trackDeg' },
  );
  add(
    'time-not-date',
    (() => {
      const p = b();
      p.time = 'tomorrow morning';
      return p;
    })(),
    'time that is not a date',
    { path: 'time' },
  );
  add(
    'time-no-zone',
    (() => {
      const p = b();
      p.time = '2026-12-01T09:30:00';
      return p;
    })(),
    'time without a zone',
    { path: 'time' },
  );
  add(
    'time-year-275760',
    (() => {
      const p = b();
      p.time = '+275760-09-13T00:00:00Z';
      return p;
    })(),
    'time at the end of the ECMAScript date range',
    { path: 'time' },
  );
  add('empty-sites', { ...b(), sites: [] }, 'no sites at all');
  add(
    'empty-layers',
    (() => {
      const p = b();
      (p.winds as Json).layers = [];
      delete (p.winds as Json).forecasts;
      return p;
    })(),
    'no wind layers',
  );
  add(
    'all-hover-calm',
    (() => {
      const p = b();
      p.carrier = { groundSpeed_mps: 0, trackDeg: 0 };
      (p.winds as Json).layers = [];
      delete (p.winds as Json).forecasts;
      p.uncertainty = {};
      return p;
    })(),
    'hovering carrier in calm air with no uncertainty',
  );
  add(
    'required-phit-0-and-1',
    (() => {
      const p = b();
      p.requiredPHit = 0;
      (p.sites as Json[])[1].variant = 'vane-steer';
      return p;
    })(),
    'requiredPHit 0 (every window unbounded)',
    { path: 'requiredPHit' },
  );
  add(
    'mass-ratio-extreme',
    (() => {
      const p = b();
      Object.assign((p.variants as Json[])[0], { referenceMass_kg: 1e-320, payloadMass_kg: 1000 });
      return p;
    })(),
    'reference mass 1e-320 kg with payload 1000 kg (descent rate × √(m/m_ref))',
    {
      separate: true,
      path: 'variants[0].referenceMass_kg',
    },
  );
  return out;
}

/** Script payloads in every text field at once, through the brief and every export. */
function outputCases(): HostileCase[] {
  const runs: CliRun[] = ['plan-text', 'brief', 'kml', 'gpx', 'geojson', 'csv'];
  const make = (
    id: string,
    payload: string,
    source: string,
    category: 'script' | 'scale',
  ): HostileCase => {
    const p = basePlan();
    p.name = payload;
    renameVariant(p, 0, `${payload}-v`);
    (p.variants as Json[]).forEach((v) => (v.name = payload));
    (p.sites as Json[]).forEach((s, i) => {
      s.name = payload;
      if (i === 0) s.id = `${payload}-s`;
    });
    setAt(p, 'safety.noDropZones[0].properties.name', payload);
    setAt(p, 'safety.checklist[0].text', payload);
    setAt(p, 'safety.checklist[0].note', payload);
    setAt(p, 'safety.signoff.reason', payload);
    return planCase(id, p, {
      category,
      probes: `${JSON.stringify(payload)} in every text field, through text, brief, KML, GPX, GeoJSON and CSV`,
      source,
      payload,
      runs,
    });
  };
  return [
    make(
      'out-html-img',
      '<img src=x onerror=alert(1)>',
      'OWASP XSS Filter Evasion Cheat Sheet',
      'script',
    ),
    make(
      'out-script-break',
      '"><script>alert(1)</script>',
      'OWASP XSS Filter Evasion Cheat Sheet',
      'script',
    ),
    make(
      'out-xml-break',
      ']]></name><x>&amp;<!--',
      'XML 1.0 §2.4, §2.7 // common practice',
      'script',
    ),
    make(
      'out-csv-formula',
      '=HYPERLINK("http://example.invalid","x")',
      'OWASP CSV Injection',
      'scale',
    ),
    make('out-csv-at', '@SUM(1+1)*cmd', 'OWASP CSV Injection', 'scale'),
    make('out-csv-minus', '-2+3+cmd', 'OWASP CSV Injection', 'scale'),
  ];
}

/** Files that are not a plan's JSON at all (bytes as found on disk). */
function fileCases(): HostileCase[] {
  const demoText = JSON.stringify(basePlan(), null, 2);
  const enc = (s: string) => new TextEncoder().encode(s);
  const cat = (...parts: Uint8Array[]) => {
    const out = new Uint8Array(parts.reduce((n, p) => n + p.length, 0));
    let o = 0;
    for (const p of parts) {
      out.set(p, o);
      o += p.length;
    }
    return out;
  };
  const utf16 = (s: string) => {
    const b = new Uint8Array(2 + s.length * 2);
    b[0] = 0xff;
    b[1] = 0xfe;
    for (let i = 0; i < s.length; i++) {
      b[2 + 2 * i] = s.charCodeAt(i) & 0xff;
      b[3 + 2 * i] = s.charCodeAt(i) >> 8;
    }
    return b;
  };
  // Deterministic junk bytes (xorshift32), so the committed file never changes.
  let x = 2463534242;
  const junk = new Uint8Array(4096).map(
    () => ((x ^= x << 13), (x ^= x >>> 17), (x ^= x << 5), x & 0xff),
  );
  const f = (
    id: string,
    content: string | Uint8Array,
    probes: string,
    source = 'common practice',
    ext = 'json',
  ): HostileCase => ({
    id,
    file: `file/${id}.${ext}`,
    category: 'file',
    target: 'cli',
    runs: ['plan-json'],
    probes,
    source,
    content,
  });
  return [
    f(
      'bom-demo',
      cat(new Uint8Array([0xef, 0xbb, 0xbf]), enc(demoText)),
      'the filled demo plan after a UTF-8 byte-order mark (accepted like the importers)',
      'Unicode 15 §23.8 (BOM in UTF-8)',
    ),
    f('bom-only', new Uint8Array([0xef, 0xbb, 0xbf]), 'a byte-order mark and nothing else'),
    f(
      'bom-twice',
      cat(new Uint8Array([0xef, 0xbb, 0xbf, 0xef, 0xbb, 0xbf]), enc(demoText)),
      'two byte-order marks',
    ),
    f('utf16le', utf16(demoText), 'the demo plan saved as UTF-16LE', 'Unicode 15 §23.8'),
    f(
      'latin1-byte',
      cat(enc('{"name":"Caf'), new Uint8Array([0xe9]), enc('"}')),
      'a Latin-1 byte (0xE9) that is not UTF-8',
      'RFC 3629 §3',
    ),
    f(
      'overlong-utf8',
      cat(enc('{"name":"'), new Uint8Array([0xc0, 0xaf]), enc('"}')),
      'an overlong UTF-8 sequence for "/"',
      'RFC 3629 §3, §10',
    ),
    f('empty', '', 'an empty file'),
    f('whitespace', ' \n\t\r\n ', 'only whitespace'),
    f('truncated', demoText.slice(0, Math.floor(demoText.length / 2)), 'the demo plan cut in half'),
    f('trailing-comma', demoText.replace(/\n\}$/, ',\n}'), 'a trailing comma', 'RFC 8259 §4'),
    f('comments', `// plan\n${demoText}`, 'a // comment before the plan', 'RFC 8259 (no comments)'),
    f(
      'nan-literal',
      demoText.replace('"speed_mps": 3.2', '"speed_mps": NaN'),
      'a bare NaN literal',
      'RFC 8259 §6',
    ),
    f(
      'infinity-literal',
      demoText.replace('"speed_mps": 3.2', '"speed_mps": Infinity'),
      'a bare Infinity literal',
      'RFC 8259 §6',
    ),
    f('single-quotes', "{'format': 'seedfall-plan'}", 'single-quoted strings', 'RFC 8259 §7'),
    f(
      'raw-control-in-string',
      demoText.replace('"Reed Margin North"', '"Reed\u0001Margin"'),
      'an unescaped control character inside a string',
      'RFC 8259 §7',
    ),
    f(
      'nul-bytes',
      cat(enc(demoText.slice(0, 100)), new Uint8Array(64), enc(demoText.slice(100))),
      'NUL bytes in the middle of the file',
    ),
    f('junk-bytes', junk, '4 KiB of random bytes'),
    f(
      'two-plans',
      `${demoText}\n${demoText}`,
      'two JSON documents one after the other',
      'RFC 8259 §2',
    ),
    f(
      'yaml',
      'format: seedfall-plan\nversion: 1\n',
      'YAML instead of JSON',
      'common practice',
      'yaml',
    ),
    f(
      'html',
      '<!doctype html><script>alert(1)</script>',
      'an HTML page with a script',
      'OWASP XSS Filter Evasion Cheat Sheet',
      'html',
    ),
    f(
      'deep-array-100k',
      `${'['.repeat(100_000)}${']'.repeat(100_000)}`,
      'an array nested 100,000 deep',
    ),
  ];
}

// ------------------------------------------------------------------ importer inputs

const imp = (
  target: CaseMeta['target'],
  id: string,
  ext: string,
  content: string,
  items: number,
  probes: string,
  source = 'common practice',
  extra: Partial<CaseMeta> = {},
): HostileCase => ({
  id,
  file: `${target}/${id}.${ext}`,
  category: 'import',
  target,
  probes,
  source,
  items,
  content,
  ...extra,
});

function sitesCases(): HostileCase[] {
  const s = (
    id: string,
    text: string,
    items: number,
    probes: string,
    source?: string,
    extra?: Partial<CaseMeta>,
  ) => imp('sites', id, 'csv', text, items, probes, source ?? 'RFC 4180 // common practice', extra);
  const g = (
    id: string,
    v: unknown,
    items: number,
    probes: string,
    source?: string,
    extra?: Partial<CaseMeta>,
  ) =>
    imp(
      'sites',
      id,
      'geojson',
      typeof v === 'string' ? v : JSON.stringify(v),
      items,
      probes,
      source ?? 'RFC 7946',
      extra,
    );
  const k = (
    id: string,
    text: string,
    items: number,
    probes: string,
    source?: string,
    extra?: Partial<CaseMeta>,
  ) => imp('sites', id, 'kml', text, items, probes, source ?? 'OGC KML 2.2 (07-147r2)', extra);
  const pt = (lon: unknown, lat: unknown, props: Json = { name: 'p' }) => ({
    type: 'Feature',
    properties: props,
    geometry: { type: 'Point', coordinates: [lon, lat] },
  });
  const fc = (...f: unknown[]) => ({ type: 'FeatureCollection', features: f });
  const kml = (body: string, ns = '') =>
    `<?xml version="1.0" encoding="UTF-8"?>\n<kml xmlns${ns}="http://www.opengis.net/kml/2.2"><Document>${body}</Document></kml>`;
  const pm = (name: string, coords: string) =>
    `<Placemark><name>${name}</name><Point><coordinates>${coords}</coordinates></Point></Placemark>`;
  return [
    s(
      'csv-ok',
      'id,lat,lon\nn1,47.4931,21.0801\nn2,47.4932,21.0802\n',
      2,
      'two good rows (the control case)',
    ),
    s(
      'csv-bom-crlf',
      '\uFEFFid,name,lat,lon\r\nn1,Ér,47.4931,21.0801\r\n',
      1,
      'BOM and CRLF line ends',
      'RFC 4180 §2; Unicode 15 §23.8',
    ),
    s(
      'csv-decimal-comma',
      'id,lat,lon\na1,47,5,21,5\n',
      1,
      'decimal commas under a comma header (47,5 read as 47 and 5?)',
      'common practice',
      { mustReport: true },
    ),
    s(
      'csv-semicolon-decimal-comma',
      'id;lat;lon\na1;47,4931;21,0801\n',
      1,
      'semicolon-separated with decimal commas',
    ),
    s(
      'csv-out-of-range',
      'id,lat,lon,elevation_m,tolerance_m\nb1,100,21,0,10\nb2,47,200,0,10\nb3,47.49,21.08,1e308,10\nb4,47.49,21.08,90,-1\nb5,47.49,21.08,90,0\n',
      5,
      'latitude 100, longitude 200, elevation 1e308, tolerance -1 and 0',
    ),
    s(
      'csv-not-numbers',
      'id,lat,lon\nc1,NaN,21\nc2,,21\nc3,Infinity,21\nc4,0x2F,21\nc5,1e999,21\n',
      5,
      'NaN, empty, Infinity, hex and overflowing numbers',
    ),
    s(
      'csv-payload-ids',
      'id,name,lat,lon\n"<img src=x onerror=alert(1)>","<script>alert(1)</script>",47.4931,21.0801\n',
      1,
      'script payloads as id and name (must stay text)',
      'OWASP XSS Filter Evasion Cheat Sheet',
    ),
    s(
      'csv-formula-names',
      'id,name,lat,lon\n=1+1,=HYPERLINK("http://example.invalid"),47.4931,21.0801\n@cmd,+1,47.4932,21.0802\n',
      2,
      'spreadsheet formulas as ids and names',
      'OWASP CSV Injection',
    ),
    s(
      'csv-ids-64-65',
      `id,lat,lon\n${'i'.repeat(64)},47.4931,21.0801\n${'j'.repeat(65)},47.4932,21.0802\n`,
      2,
      'ids of 64 and 65 characters',
      'plan.schema.json id maxLength',
    ),
    s(
      'csv-control-ids',
      'id,lat,lon\n"a\u0001b",47.4931,21.0801\n"\u202Eevil",47.4932,21.0802\n" padded ",47.4933,21.0803\n',
      3,
      'control characters, a bidi override and padding in ids',
      'Unicode TR #36 §2.1',
    ),
    s(
      'csv-dup-ids',
      'id,lat,lon\ns01,47.4931,21.0801\nd1,47.4932,21.0802\nd1,47.4933,21.0803\n',
      3,
      'an id already in the plan and an id repeated in the file',
    ),
    s(
      'csv-unknown-variant',
      'id,lat,lon,variant\nv1,47.4931,21.0801,no-such\n',
      1,
      'a site pinned to a variant the plan lacks',
    ),
    s(
      'csv-unterminated-quote',
      'id,name,lat,lon\nq1,"open,47.4931,21.0801\nq2,ok,47.4932,21.0802\n',
      1,
      'a quote that is never closed (one record to the end, RFC 4180)',
      'RFC 4180 §2',
    ),
    s(
      'csv-ragged',
      'id,lat,lon\nr1,47.4931\nr2,47.4932,21.0802,extra,cells\n',
      2,
      'rows with too few and too many cells',
      'RFC 4180 §2',
    ),
    s('csv-header-only', 'id,lat,lon\n', 0, 'a header and no rows'),
    s('csv-no-header', '47.4931,21.0801\n47.4932,21.0802\n', 2, 'rows without a header'),
    s('csv-empty', '', 0, 'an empty file'),
    s(
      'csv-long-cell',
      `id,name,lat,lon\nl1,${'n'.repeat(100_000)},47.4931,21.0801\n`,
      1,
      'a 100,000-character name',
      'common practice (nothing grows without bound)',
    ),
    s(
      'csv-dms-utm',
      'id,lat,lon\nm1,47°29\'35"N,21°04\'50"E\nm2,91°00\'00"N,21°04\'50"E\n',
      2,
      'DMS coordinates, one beyond the pole',
    ),
    g('geojson-ok', fc(pt(21.0801, 47.4931, { id: 'g1' })), 1, 'one good point (the control case)'),
    g(
      'geojson-swapped',
      fc(pt(47.4931, 21.0801, { id: 'g1' }), pt(21.08, 147.49, { id: 'g2' })),
      2,
      'latitude first, and a latitude of 147',
      'RFC 7946 §3.1.1 ([lon, lat] order)',
    ),
    g(
      'geojson-bad-coords',
      fc(
        pt('21', '47'),
        pt(null, 47),
        pt(1e308, 47),
        { type: 'Feature', properties: {}, geometry: null },
        { type: 'Feature', properties: {}, geometry: { type: 'Point', coordinates: [] } },
      ),
      5,
      'string, null, 1e308 and missing coordinates',
      'RFC 7946 §3.1.1',
    ),
    g(
      'geojson-polygon',
      fc({
        type: 'Feature',
        properties: { id: 'poly' },
        geometry: {
          type: 'Polygon',
          coordinates: [
            [
              [21, 47],
              [21.1, 47],
              [21.1, 47.1],
              [21, 47],
            ],
          ],
        },
      }),
      1,
      'a polygon where points are expected',
      'RFC 7946 §3.1.6',
    ),
    g(
      'geojson-payload-props',
      fc(
        pt(21.0801, 47.4931, {
          id: '<img src=x onerror=alert(1)>',
          name: '"><script>alert(1)</script>',
        }),
      ),
      1,
      'script payloads as id and name',
      'OWASP XSS Filter Evasion Cheat Sheet',
    ),
    g(
      'geojson-deep-props',
      `{"type":"FeatureCollection","features":[{"type":"Feature","properties":{"id":"deep","x":${'{"a":'.repeat(10000)}1${'}'.repeat(10000)}},"geometry":{"type":"Point","coordinates":[21.08,47.49]}}]}`,
      1,
      'properties nested 10,000 deep',
    ),
    g(
      'geojson-proto',
      '{"type":"FeatureCollection","features":[{"type":"Feature","properties":{"__proto__":{"id":"polluted"},"id":"p1"},"geometry":{"type":"Point","coordinates":[21.08,47.49]}}]}',
      1,
      'a "__proto__" property key',
      'OWASP Prototype Pollution Prevention Cheat Sheet',
    ),
    g(
      'geojson-not-json',
      '{"type":"FeatureCollection","features":[',
      0,
      'GeoJSON cut short',
      'RFC 8259',
    ),
    g(
      'geojson-bare-geometry',
      { type: 'Point', coordinates: [21.08, 47.49] },
      1,
      'a bare Point geometry',
      'RFC 7946 §3.1.2',
    ),
    g(
      'geojson-altitude',
      fc(pt(21.0801, 47.4931), {
        type: 'Feature',
        properties: { id: 'z' },
        geometry: { type: 'Point', coordinates: [21.08, 47.49, 1e308] },
      }),
      2,
      'a third coordinate of 1e308 m',
      'RFC 7946 §3.1.1',
    ),
    k(
      'kml-ok',
      kml(pm('k1', '21.0801,47.4931,0') + pm('k2', '21.0802,47.4932')),
      2,
      'two good placemarks (the control case)',
    ),
    k(
      'kml-prefixed',
      '<?xml version="1.0"?><kml:kml xmlns:kml="http://www.opengis.net/kml/2.2"><kml:Document><kml:Placemark><kml:name>p1</kml:name><kml:Point><kml:coordinates>21.08,47.49</kml:coordinates></kml:Point></kml:Placemark><kml:Placemark><kml:name>p2</kml:name><kml:Point><kml:coordinates>21.081,47.491</kml:coordinates></kml:Point></kml:Placemark></kml:Document></kml:kml>',
      2,
      'KML written with a kml: namespace prefix',
      'Namespaces in XML 1.0 // from memory',
    ),
    k(
      'kml-payload-name',
      kml(
        pm('&lt;img src=x onerror=alert(1)&gt;', '21.0801,47.4931') +
          pm('<![CDATA[<script>alert(1)</script>]]>', '21.0802,47.4932'),
      ),
      2,
      'escaped and CDATA script payloads as placemark names',
      'OWASP XSS Filter Evasion Cheat Sheet',
    ),
    k(
      'kml-xxe',
      '<?xml version="1.0"?><!DOCTYPE kml [<!ENTITY xxe SYSTEM "file:///etc/passwd">]><kml xmlns="http://www.opengis.net/kml/2.2"><Document>' +
        pm('&xxe;', '21.0801,47.4931') +
        '</Document></kml>',
      1,
      'an external entity naming /etc/passwd (XXE)',
      'OWASP XML External Entity Prevention Cheat Sheet',
    ),
    k(
      'kml-billion-laughs',
      '<?xml version="1.0"?><!DOCTYPE lolz [<!ENTITY lol "lol"><!ENTITY lol2 "&lol;&lol;&lol;&lol;&lol;&lol;&lol;&lol;&lol;&lol;"><!ENTITY lol3 "&lol2;&lol2;&lol2;&lol2;&lol2;&lol2;&lol2;&lol2;&lol2;&lol2;"><!ENTITY lol4 "&lol3;&lol3;&lol3;&lol3;&lol3;&lol3;&lol3;&lol3;&lol3;&lol3;"><!ENTITY lol5 "&lol4;&lol4;&lol4;&lol4;&lol4;&lol4;&lol4;&lol4;&lol4;&lol4;"><!ENTITY lol6 "&lol5;&lol5;&lol5;&lol5;&lol5;&lol5;&lol5;&lol5;&lol5;&lol5;">]><kml xmlns="http://www.opengis.net/kml/2.2"><Document>' +
        pm('&lol6;', '21.0801,47.4931') +
        '</Document></kml>',
      1,
      'nested entity expansion ("billion laughs")',
      'OWASP XML Security Cheat Sheet',
    ),
    k(
      'kml-malformed',
      kml(pm('m1', '21.0801,47.4931')).replace('</Document>', ''),
      1,
      'an unclosed element',
      'XML 1.0 §2.1',
    ),
    k(
      'kml-bad-coords',
      kml(
        pm('b1', 'abc,def') +
          pm('b2', '21.08,95') +
          pm('b3', '') +
          '<Placemark><name>b4</name></Placemark>',
      ),
      4,
      'letters, latitude 95, empty coordinates and no geometry',
      'OGC KML 2.2 (07-147r2) kml:coordinates // from memory',
    ),
  ];
}

const FB_HEADER = 'FT  3000    6000    9000   12000   18000   24000  30000  34000  39000';
const fb = (...stations: string[]) =>
  [
    'WINDS ALOFT FORECAST (INVENTED EXAMPLE)',
    'VALID 121800Z   FOR USE 1400-2100Z. TEMPS NEG ABV 24000',
    '',
    FB_HEADER,
    ...stations,
  ].join('\n');
// Station lines follow the NWS "FB" layout: DDff±TT groups right-aligned under the levels.
const QXV = 'QXV 2714 2725+00 2731-04 2638-09 2550-21 2562-33 257942 779955 760258';

function windsAloftCases(): HostileCase[] {
  const w = (id: string, text: string, items: number, probes: string, extra?: Partial<CaseMeta>) =>
    imp(
      'winds-aloft',
      id,
      'txt',
      text,
      items,
      probes,
      'NWS winds-aloft (FB) product layout',
      extra,
    );
  return [
    w('fb-ok', fb(QXV), 9, 'one good station (the control case)'),
    w(
      'fb-199kt',
      fb('QHI 2714 2725+00 2731-04 2638-09 2550-21 2562-33 257942 779955 779958'),
      9,
      'groups coded 199 kt (102 m/s, above the plan limit of 100 m/s)',
    ),
    w(
      'fb-plus99',
      fb('QHT 2714 2725+99 2731+99 2638+99 2550+99 2562+99 257942 779955 760258'),
      9,
      'temperatures of +99 °C (372 K, above the plan limit of 350 K)',
    ),
    w(
      'fb-bad-groups',
      fb('QBD 27X4 2725+00 9905+00 4031-04 2638-9 2550-21 2562-33 257942 7799'),
      9,
      'letters, 99 with a speed, direction 40, short groups',
    ),
    w('fb-extra-groups', fb(`${QXV} 2714 2714 2714`), 12, 'more groups than levels'),
    w('fb-no-header', QXV, 0, 'a station line without the level header'),
    w(
      'fb-tabs-crlf',
      fb(QXV).replace(/ {4}/g, '\t').replace(/\n/g, '\r\n'),
      9,
      'tabs and CRLF line ends',
    ),
    w('fb-dup-station', fb(QXV, QXV.replace('2714', '0505')), 18, 'the same station twice'),
    w(
      'fb-control-chars',
      fb(QXV).replace('2725+00', '2725\u0000+00'),
      9,
      'a NUL byte inside a group',
    ),
  ];
}

function soundingCases(): HostileCase[] {
  const r = (id: string, text: string, items: number, probes: string, extra?: Partial<CaseMeta>) =>
    imp('sounding', id, 'csv', text, items, probes, 'RFC 4180 // common practice', extra);
  const H = 'altitude_m,direction_deg,speed_mps,temperature_C\n';
  return [
    r(
      'snd-ok',
      `${H}10,270,3,8\n100,280,5,7\n300,290,7,5\n`,
      3,
      'three good rows (the control case)',
    ),
    r(
      'snd-units-kt-f-ft',
      'altitude_ft_agl,dir,speed (kt),temp °F\n30,270,6,46\n330,280,10,44\n',
      2,
      'feet, knots and °F',
    ),
    r(
      'snd-hot',
      `${H}10,270,3,99\n100,280,5,99\n`,
      2,
      '+99 °C (372 K, above the plan limit of 350 K)',
    ),
    r(
      'snd-fast',
      `${H}10,270,3,8\n100,280,150,7\n`,
      2,
      '150 m/s (above the plan limit of 100 m/s)',
    ),
    r(
      'snd-high',
      `${H}10,270,3,8\n25000,280,5,-50\n`,
      2,
      'a row at 25,000 m (above the plan wind-layer limit of 20,000 m)',
    ),
    r(
      'snd-bad-cells',
      `${H}10,361,3,8\n20,NaN,3,8\n30,270,,8\n40,270,-1,8\n,270,3,8\n50,270,3,abc\n`,
      6,
      'direction 361, NaN, empty, negative speed, missing altitude, letters',
    ),
    r(
      'snd-repeat-altitude',
      `${H}10,270,3,8\n10,280,5,7\n100,290,7,5\n`,
      3,
      'two rows at one altitude (the plan refuses repeated layer altitudes)',
    ),
    r('snd-descending', `${H}300,290,7,5\n100,280,5,7\n10,270,3,8\n`, 3, 'rows from top to bottom'),
    r(
      'snd-semicolon-comma',
      'altitude_m;direction_deg;speed_mps;temperature_C\n10;270;3,5;8,5\n100;280;5,5;7,5\n',
      2,
      'semicolons with decimal commas',
    ),
    r('snd-no-header', '10,270,3,8\n100,280,5,7\n', 2, 'rows without a header'),
    r(
      'snd-bom-junk',
      `\uFEFF${H}10,270,3,8\n\u0000\u0001\u0002\n100,280,5,7\n`,
      2,
      'BOM and a line of control characters',
    ),
    r('snd-empty', '', 0, 'an empty file'),
  ];
}

function surfaceCases(): HostileCase[] {
  // What the Winds panel accepts: height in (0, 100] m, speed 0–100, direction 0–360.
  const s = (id: string, v: Json, probes: string) =>
    imp(
      'surface',
      id,
      'json',
      JSON.stringify(v),
      0,
      probes,
      "common practice (the panel's accepted ranges)",
    );
  return [
    s(
      'sfc-ok',
      { height_m: 2, speed_mps: 3, fromDeg: 270, law: 'log', terrain: 'open' },
      'a 2 m reading of 3 m/s (the control case)',
    ),
    s(
      'sfc-denormal-height',
      { height_m: 1e-320, speed_mps: 3, fromDeg: 270, law: 'power', terrain: 'open' },
      'a reading height of 1e-320 m with the power law',
    ),
    s(
      'sfc-fast',
      { height_m: 2, speed_mps: 100, fromDeg: 270, law: 'power', terrain: 'open' },
      'a 100 m/s reading (the power law grows it above 100 m/s aloft)',
    ),
    s(
      'sfc-log-below-z0',
      { height_m: 0.01, speed_mps: 3, fromDeg: 270, law: 'log', terrain: 'urban' },
      'a log-law reading below the roughness length',
    ),
    s(
      'sfc-high-forecast',
      {
        height_m: 2,
        speed_mps: 3,
        fromDeg: 270,
        law: 'log',
        terrain: 'open',
        lowestLayer_m: 20000,
      },
      'a forecast whose lowest layer is at 20,000 m (a 10 m step gives 2,000 layers)',
    ),
    s(
      'sfc-dir-360',
      { height_m: 100, speed_mps: 0, fromDeg: 360, law: 'log', terrain: 'open' },
      'calm at 100 m from 360°',
    ),
  ];
}

/**
 * terrain.file: names the schema refuses (exit 2), and files that cannot be an elevation model
 * (exit 1, one line). The two model files are cases of their own too (not a plan either): a
 * plan case in cases/plan/ names them as ../terrain/….
 */
function terrainCases(): HostileCase[] {
  let x = 88675123;
  const junk = new Uint8Array(3000).map(
    () => ((x ^= x << 13), (x ^= x >>> 17), (x ^= x << 5), x & 0xff),
  );
  // A little-endian TIFF header that points its first directory past the end of the file.
  const cut = new Uint8Array([0x49, 0x49, 0x2a, 0x00, 0xff, 0xff, 0x00, 0x00, 0x01, 0x00]);
  const files: HostileCase[] = [
    ['junk-dem', junk, 'tif', 'random bytes named .tif'],
    ['cut-dem', cut, 'tiff', 'a TIFF header whose first directory lies past the end'],
    [
      'header-dem',
      'ncols 3\nnrows two\ncellsize 1\n1 2 3\n',
      'asc',
      'an ASCII grid with nrows "two"',
    ],
  ].map(([id, content, ext, what]) => ({
    id: String(id),
    file: `terrain/${String(id)}.${String(ext)}`,
    category: 'file' as const,
    target: 'cli' as const,
    runs: ['plan-json'] as CliRun[],
    probes: `${String(what)}, given as the plan file`,
    source: 'common practice',
    content: content as string | Uint8Array,
  }));
  const base = basePlan();
  const named = (id: string, file: unknown, probes: string, source: string, runs?: CliRun[]) => {
    const p = clone(base);
    p.terrain = { file };
    return planCase(`terrain-${id}`, p, {
      category: 'file',
      probes,
      source,
      path: 'terrain.file',
      ...(runs ? { runs } : {}),
      ...(typeof file === 'string' && /[<>"&]/.test(file) ? { payload: file } : {}),
    });
  };
  return [
    ...files,
    named('junk', '../terrain/junk-dem.tif', 'terrain.file names random bytes', 'common practice', [
      'plan-json',
      'brief',
      'geojson',
    ]),
    named(
      'cut',
      '../terrain/cut-dem.tiff',
      'terrain.file names a cut TIFF',
      'TIFF 6.0 §2 (IFD offset)',
    ),
    named(
      'header',
      '../terrain/header-dem.asc',
      'terrain.file names a grid with a bad header',
      'ESRI ASCII grid header // common practice',
    ),
    named(
      'missing',
      'no-such-dem.tif',
      'terrain.file names a file that does not exist',
      'common practice',
    ),
    named(
      'folder',
      '../terrain',
      'terrain.file names a folder (no extension)',
      'plan.schema.json terrain.file pattern',
    ),
    named(
      'traversal',
      '../../../../../../../../../../etc/passwd.asc',
      'terrain.file climbs out of the plan folder to a file that is not there',
      'OWASP Path Traversal',
    ),
    named(
      'payload',
      '<img src=x onerror=alert(1)>.tif',
      'terrain.file is markup',
      'OWASP XSS Filter Evasion Cheat Sheet',
      ['plan-json', 'brief'],
    ),
    named(
      'ansi',
      '\u001b[31mred.tif',
      'terrain.file holds a terminal escape',
      'ECMA-48 control sequences // common practice',
    ),
    named('nul', 'a\u0000.asc', 'terrain.file holds NUL', 'common practice (control characters)'),
    named(
      'png',
      'dem.png',
      'terrain.file is not a .tif, .tiff or .asc',
      'plan.schema.json terrain.file pattern',
    ),
    named(
      'len-1001',
      `${'d'.repeat(997)}.tif`,
      'terrain.file of 1001 characters',
      'plan.schema.json terrain.file maxLength',
    ),
    named('empty', '', 'terrain.file empty', 'plan.schema.json minLength'),
    named('number', 5, 'terrain.file a number', 'common practice (wrong type)'),
  ];
}

/** Every small case (committed under tests/hostile/cases/). */
export function smallCases(): HostileCase[] {
  return [
    ...fileCases(),
    ...terrainCases(),
    ...fieldCases(),
    ...missingCases(),
    ...shapeCases(),
    ...outputCases(),
    ...sitesCases(),
    ...windsAloftCases(),
    ...soundingCases(),
    ...surfaceCases(),
  ];
}

/** Cases too large to commit, made at test time. Paths are relative to `dir` unless absolute. */
export function largeCases(): HostileCase[] {
  const big = (
    id: string,
    category: CaseMeta['category'],
    plan: unknown,
    probes: string,
    extra: Partial<CaseMeta> = {},
  ): HostileCase => ({
    id,
    file: `plan/${id}.json`,
    category,
    target: 'cli',
    runs: ['plan-json'],
    probes,
    source: 'plan.schema.json maxItems',
    large: true,
    content: typeof plan === 'string' ? plan : JSON.stringify(plan),
    ...extra,
  });
  const grid = (n: number) =>
    Array.from({ length: n }, (_, i) => ({
      id: `g${i}`,
      lat: 47.4885 + 0.0003 * Math.floor(i / 40),
      lon: 21.074 + 0.0004 * (i % 40),
      elevation_m: 89,
      tolerance_m: 20,
    }));
  const withPlan = (f: (p: Json) => void) => {
    const p = basePlan();
    f(p);
    return p;
  };
  const layers = (n: number) =>
    Array.from({ length: n }, (_, i) => ({ altitude_m: 5 + i, fromDeg: 270, speed_mps: 5 }));
  const problems10k = withPlan((p) => {
    p.sites = Array.from({ length: 2500 }, (_, i) => ({
      id: `x${i}`,
      lat: 123,
      lon: 456,
      tolerance_m: -1,
      elevation_m: 1e9,
    }));
  });
  const csvRows = (n: number) =>
    `id,lat,lon\n${Array.from({ length: n }, (_, i) => `r${i},${(47.4 + (i % 1000) * 1e-4).toFixed(4)},${(21 + Math.floor(i / 1000) * 1e-4).toFixed(4)}`).join('\n')}\n`;
  const dev = (id: string, path: string, probes: string): HostileCase => ({
    id,
    file: path,
    category: 'file',
    target: 'cli',
    runs: ['plan-json'],
    probes,
    source: 'common practice (bounded reads)',
    large: true,
    separate: true,
    content: null,
  });
  return [
    dev('dev-zero', '/dev/zero', 'an endless device'),
    dev('directory', '.', 'a directory'),
    dev('fifo-no-writer', 'fifo', 'a named pipe nobody writes to'),
    big(
      'over-32mib',
      'file',
      `{"name":"${'a'.repeat(33 * 1024 * 1024)}"}`,
      'a 33 MiB file (over the 32 MiB read bound)',
      { source: 'common practice (bounded reads)', separate: true },
    ),
    big(
      'problems-10000',
      'file',
      problems10k,
      '2,500 sites with 4 bad fields each: 10,000 problems to a pipe',
      { separate: true },
    ),
    big(
      'unknown-fields-20000',
      'ranges',
      withPlan((p) => {
        for (let i = 0; i < 20_000; i++) p[`${i}-${'x'.repeat(1000)}`] = 1;
      }),
      '20,000 unknown fields with 1,000-character names (a 20 MB file, under the read bound)',
      { source: 'common practice (nothing grows without bound)' },
    ),
    big(
      'sites-1001',
      'ranges',
      withPlan((p) => (p.sites = grid(1001))),
      '1,001 sites (limit 1,000)',
    ),
    big(
      'layers-201',
      'ranges',
      withPlan((p) => ((p.winds as Json).layers = layers(201))),
      '201 wind layers (limit 200)',
    ),
    big(
      'variants-101',
      'ranges',
      withPlan(
        (p) =>
          (p.variants = Array.from({ length: 101 }, (_, i) => ({
            id: `v${i}`,
            guidance: 'passive',
            descentRate_mps: 3,
          }))),
      ),
      '101 variants (limit 100)',
    ),
    big(
      'sounding-501',
      'ranges',
      withPlan(
        (p) =>
          ((p.atmosphere as Json).sounding = {
            levels: Array.from({ length: 501 }, (_, i) => ({
              altitude_m: i * 10,
              temperature_K: 280,
            })),
          }),
      ),
      '501 sounding levels (limit 500)',
    ),
    big(
      'zone-5001',
      'ranges',
      withPlan((p) =>
        setAt(p, 'safety.noDropZones[0].geometry.coordinates[0]', [
          ...Array.from({ length: 5000 }, (_, i) => [21.07 + i * 1e-6, 47.48 + (i % 2) * 1e-4]),
          [21.07, 47.48],
        ]),
      ),
      'a zone ring of 5,001 positions (limit 5,000)',
    ),
    big(
      'forecasts-49',
      'ranges',
      withPlan(
        (p) =>
          ((p.winds as Json).forecasts = Array.from({ length: 49 }, (_, i) => ({
            time: `2026-12-01T${String(10 + Math.floor(i / 6)).padStart(2, '0')}:${String((i % 6) * 10).padStart(2, '0')}:00+01:00`,
            layers: layers(3),
          }))),
      ),
      '49 forecasts (limit 48)',
    ),
    big(
      'sites-1000-brief-export',
      'scale',
      withPlan((p) => (p.sites = grid(1000))),
      'a plan at the 1,000-site maximum through export and brief',
      {
        runs: ['csv', 'brief'],
        source: 'plan.schema.json maxItems (sites)',
      },
    ),
    big(
      'all-at-maximum',
      'scale',
      withPlan((p) => {
        p.sites = grid(1000);
        p.variants = Array.from({ length: 100 }, (_, i) => ({
          id: `v${i}`,
          guidance: 'passive',
          descentRate_mps: 2 + i * 0.01,
        }));
        p.monteCarlo = { samples: 100_000, seed: 1 };
      }),
      '1,000 sites × 100 variants × 100,000 samples: every count at its documented maximum',
      { source: 'plan.schema.json maxItems and maximum' },
    ),
    {
      ...imp(
        'sites',
        'csv-1m-rows',
        'csv',
        csvRows(1_000_000),
        1_000_000,
        'a sites CSV of 1,000,000 rows (plan limit 1,000 sites)',
      ),
      large: true,
    },
    {
      ...imp(
        'sites',
        'csv-1001-rows',
        'csv',
        csvRows(1001),
        1001,
        'a sites CSV of 1,001 rows (plan limit 1,000 sites)',
      ),
      large: true,
    },
    {
      ...imp(
        'sounding',
        'snd-1000-rows',
        'csv',
        `altitude_m,direction_deg,speed_mps,temperature_C\n${Array.from({ length: 1000 }, (_, i) => `${10 + i * 10},270,5,5`).join('\n')}\n`,
        1000,
        '1,000 sounding rows (plan limit 200 layers)',
      ),
      large: true,
    },
    {
      ...imp(
        'winds-aloft',
        'fb-40-stations',
        'txt',
        fb(
          ...Array.from({ length: 40 }, (_, i) =>
            QXV.replace(
              'QXV',
              `Q${String.fromCharCode(65 + Math.floor(i / 26))}${String.fromCharCode(65 + (i % 26))}`,
            ),
          ),
        ),
        360,
        '40 stations',
      ),
      large: true,
    },
  ];
}

/** Writes the small cases and their manifest (one note per case) to tests/hostile/cases/. */
export function writeSmallCases(dir = CASES_DIR): void {
  rmSync(dir, { recursive: true, force: true });
  const manifest = smallCases().map(({ content, ...meta }) => {
    mkdirSync(dirname(join(dir, meta.file)), { recursive: true });
    writeFileSync(join(dir, meta.file), content ?? '');
    return meta;
  });
  writeFileSync(join(dir, 'manifest.json'), `${JSON.stringify(manifest, null, 1)}\n`);
}

if (process.argv[1] && resolve(process.argv[1]) === fileURLToPath(import.meta.url)) {
  writeSmallCases();
  process.stdout.write(`wrote ${smallCases().length} cases to ${CASES_DIR}\n`);
}
