import type { ErrorObject } from 'ajv';
import type { Plan, PlanFile } from './plan';
import { resolvePlan } from './plan-defaults';
import {
  frameLimitIssues,
  massIssues,
  nestingIssue,
  workIssue,
  zoneLatitudeIssues,
} from './plan-limits';
import schema from './plan.schema.json';
// Precompiled by `npm run gen:validator` (ajv standalone, options allErrors + verbose): no code
// is compiled at run time, so the page's Content-Security-Policy can forbid eval.
import checkSchema from './plan-validator.generated';

/** One problem in a plan file; `message` is a sentence that starts with `path` ('' = the plan). */
export interface PlanIssue {
  path: string;
  message: string;
}

export type PlanValidation =
  { ok: true; plan: Plan; warnings: string[] } | { ok: false; errors: PlanIssue[] };

type Json = Record<string, unknown>;
type SchemaNode = Json & { properties?: Json };

const STEERED = new Set(['fixed-heading', 'homing']);
const PATTERN_HINTS: Record<string, string> = {
  [schema.definitions.id.pattern]: 'must be printable characters with no leading or trailing space',
  [schema.properties.terrain.properties.file.pattern]:
    'must name a .tif, .tiff or .asc file, with no control characters',
};

const isRecord = (x: unknown): x is Json =>
  typeof x === 'object' && x !== null && !Array.isArray(x);
const isNum = (x: unknown): x is number => typeof x === 'number' && Number.isFinite(x);
const subject = (path: string): string => path || 'plan';
const child = (path: string, key: string): string => (path ? `${path}.${key}` : key);

/** JSON pointer (/variants/0/id) to the house path form (variants[0].id). */
function toPath(pointer: string): string {
  let path = '';
  for (const raw of pointer.split('/').slice(1)) {
    const key = raw.replace(/~1/g, '/').replace(/~0/g, '~');
    path = /^\d+$/.test(key) ? `${path}[${key}]` : child(path, key);
  }
  return path;
}

/** The full allowed range of a numeric schema node, e.g. "between -90 and 90" or "> 0 and ≤ 30". */
function rangeText(s: SchemaNode): string {
  // "0 or between 0.5 and 100": a range with a gap cut out of it by `not`.
  const gap = isRecord(s.not) ? (s.not as SchemaNode) : undefined;
  if (gap && isNum(s.minimum) && isNum(s.maximum) && gap.exclusiveMinimum === s.minimum) {
    return `${s.minimum} or between ${String(gap.exclusiveMaximum)} and ${s.maximum}`;
  }
  const lo = isNum(s.minimum)
    ? `≥ ${s.minimum}`
    : isNum(s.exclusiveMinimum)
      ? `> ${s.exclusiveMinimum}`
      : '';
  const hi = isNum(s.maximum)
    ? `≤ ${s.maximum}`
    : isNum(s.exclusiveMaximum)
      ? `< ${s.exclusiveMaximum}`
      : '';
  if (isNum(s.minimum) && isNum(s.maximum)) return `between ${s.minimum} and ${s.maximum}`;
  return [lo, hi].filter(Boolean).join(' and ');
}

function numberText(s: SchemaNode, fallbackType: string): string {
  const noun = (s.type ?? fallbackType) === 'integer' ? 'an integer' : 'a number';
  const range = rangeText(s);
  // "a number, 0 or between 0.5 and 100" reads better than running the value on from the noun.
  return range ? `${noun}${/^-?\d/.test(range) ? ',' : ''} ${range}` : noun;
}

function editDistance(a: string, b: string): number {
  let prev = Array.from({ length: b.length + 1 }, (_, j) => j);
  for (let i = 1; i <= a.length; i++) {
    const cur = [i];
    for (let j = 1; j <= b.length; j++) {
      cur[j] = Math.min(prev[j] + 1, cur[j - 1] + 1, prev[j - 1] + (a[i - 1] === b[j - 1] ? 0 : 1));
    }
    prev = cur;
  }
  return prev[b.length];
}

const MAX_SUGGEST_LENGTH = 40;

/** The known field a typo most likely meant, if one is close enough. */
function suggestion(unknown: string, node: SchemaNode): string {
  // A typo is short; a long name is no typo, and comparing it costs its length squared.
  if (unknown.length > MAX_SUGGEST_LENGTH) return '';
  let best = '';
  let bestD = Infinity;
  for (const name of Object.keys(node.properties ?? {})) {
    const d = editDistance(unknown.toLowerCase(), name.toLowerCase());
    if (d < bestD) [best, bestD] = [name, d];
  }
  return bestD <= Math.max(1, Math.floor(best.length / 4)) ? ` (did you mean "${best}"?)` : '';
}

function translate(e: ErrorObject): PlanIssue {
  const at = toPath(e.instancePath);
  const s = (e.parentSchema ?? {}) as SchemaNode;
  const p = e.params as Record<string, unknown>;
  const say = (path: string, rest: string): PlanIssue => ({
    path,
    message: `${subject(path)} ${rest}`,
  });
  switch (e.keyword) {
    case 'required':
      return say(child(at, String(p.missingProperty)), 'is required');
    case 'additionalProperties': {
      const name = String(p.additionalProperty);
      return say(at, `has an unknown field ${JSON.stringify(name)}${suggestion(name, s)}`);
    }
    case 'type':
      if (p.type === 'number' || p.type === 'integer')
        return say(at, `must be ${numberText(s, String(p.type))}`);
      return say(at, `must be ${p.type === 'object' || p.type === 'array' ? 'an' : 'a'} ${p.type}`);
    case 'minimum':
    case 'maximum':
    case 'exclusiveMinimum':
    case 'exclusiveMaximum':
    case 'not':
      return say(at, `must be ${s.type === 'integer' ? numberText(s, 'integer') : rangeText(s)}`);
    case 'const':
      return say(at, `must be ${JSON.stringify(p.allowedValue)}`);
    case 'enum': {
      const vals = (p.allowedValues as unknown[]).map((v) => JSON.stringify(v));
      return say(
        at,
        `must be ${vals.length > 2 ? 'one of ' : ''}${vals.slice(0, -1).join(', ')} or ${vals.at(-1)}`,
      );
    }
    case 'minLength':
      return say(
        at,
        p.limit === 1 ? 'must not be empty' : `must be at least ${p.limit} characters long`,
      );
    case 'maxLength':
      return say(at, `must be at most ${p.limit} characters long`);
    case 'minItems':
      return say(at, `must have at least ${p.limit} ${p.limit === 1 ? 'entry' : 'entries'}`);
    case 'maxItems':
      return say(at, `must have at most ${p.limit} entries`);
    case 'pattern':
      return say(at, PATTERN_HINTS[String(p.pattern)] ?? `must match ${String(p.pattern)}`);
    case 'format':
      return say(
        at,
        'must be an ISO 8601 date-time with a time zone, e.g. "2026-12-01T09:30:00+01:00"',
      );
    default:
      return say(at, e.message ?? 'is not valid');
  }
}

/** Schema errors in house form: one per field (the first), but every unknown or missing field. */
function schemaIssues(raw: unknown): PlanIssue[] {
  const check = checkSchema;
  if (check(raw)) return [];
  const seen = new Set<string>();
  const out: PlanIssue[] = [];
  for (const e of check.errors ?? []) {
    const issue = translate(e);
    const perField = e.keyword !== 'additionalProperties' && e.keyword !== 'required';
    const key = perField ? `field:${issue.path}` : `msg:${issue.message}`;
    if (!seen.has(key)) out.push(issue);
    seen.add(key);
  }
  return out;
}

const list = (x: unknown): unknown[] => (Array.isArray(x) ? x : []);
function label(s: Json, i: number): string {
  const name = typeof s.name === 'string' ? s.name : s.id;
  return typeof name === 'string' ? `sites[${i}] ${JSON.stringify(name)}` : `sites[${i}]`;
}

/** Records `path` the first time `key` is seen; returns the earlier path on a repeat. */
function firstUse(seen: Map<string, string>, key: string, path: string): string | undefined {
  const earlier = seen.get(key);
  if (earlier === undefined) seen.set(key, path);
  return earlier;
}

/** Checks JSON Schema cannot express; reads `raw` defensively since it may also be invalid. */
function semanticIssues(raw: Json, already: PlanIssue[]): PlanIssue[] {
  const out: PlanIssue[] = [];
  const add = (path: string, rest: string) => out.push({ path, message: `${path} ${rest}` });

  const variantIds = new Map<string, string>();
  list(raw.variants).forEach((v, i) => {
    if (!isRecord(v)) return;
    const at = `variants[${i}]`;
    if (typeof v.id === 'string' && v.id !== '') {
      const earlier = firstUse(variantIds, v.id, at);
      if (earlier) add(`${at}.id`, `${JSON.stringify(v.id)} is already used by ${earlier}`);
    }
    if (typeof v.guidance === 'string' && STEERED.has(v.guidance)) {
      const why = `for a steered variant (guidance ${JSON.stringify(v.guidance)})`;
      if (v.glideAngle_deg === undefined) add(`${at}.glideAngle_deg`, `is required ${why}`);
      else if (v.glideAngle_deg === 90) add(`${at}.glideAngle_deg`, `must be < 90 ${why}`);
      if (v.controlTime_s === undefined) add(`${at}.controlTime_s`, `is required ${why}`);
    }
    if (v.payloadMass_kg !== undefined && v.referenceMass_kg === undefined) {
      add(`${at}.referenceMass_kg`, 'is required when payloadMass_kg is given');
    }
  });

  const known = [...variantIds.keys()];
  // A pin may name a variant whose id is itself broken: report the id, not every pin to it.
  const idsReadable =
    Array.isArray(raw.variants) && !already.some((e) => /^variants\[\d+\]\.id$/.test(e.path));
  const siteIds = new Map<string, string>();
  list(raw.sites).forEach((s, i) => {
    if (!isRecord(s)) return;
    const at = `sites[${i}]`;
    if (typeof s.id === 'string' && s.id !== '') {
      const earlier = firstUse(siteIds, s.id, at);
      if (earlier) add(`${at}.id`, `${JSON.stringify(s.id)} is already used by ${earlier}`);
    }
    if (idsReadable && typeof s.variant === 'string' && !variantIds.has(s.variant)) {
      const shown = known.length
        ? known.slice(0, 12).join(', ') + (known.length > 12 ? ', …' : '')
        : 'none';
      add(`${at}.variant`, `${JSON.stringify(s.variant)} is not a variant id (known: ${shown})`);
    }
  });

  releaseAboveSites(raw, add);
  out.push(...massIssues(raw), ...zoneLatitudeIssues(raw));

  const altitudes = new Map<string, string>();
  const winds = isRecord(raw.winds) ? raw.winds : {};
  list(winds.layers).forEach((l, i) => {
    if (!isRecord(l) || !isNum(l.altitude_m)) return;
    const at = `winds.layers[${i}].altitude_m`;
    const earlier = firstUse(altitudes, String(l.altitude_m), `winds.layers[${i}]`);
    if (earlier) add(at, `repeats the altitude of ${earlier} (${l.altitude_m} m)`);
  });

  const timeChecked = already.some((e) => e.path === 'time');
  if (typeof raw.time === 'string' && !timeChecked && Number.isNaN(Date.parse(raw.time))) {
    add('time', `${JSON.stringify(raw.time)} cannot be read as a date and time`);
  }
  return out;
}

/** Release altitude, converted to MSL, must be above every site's ground. */
function releaseAboveSites(raw: Json, add: (path: string, rest: string) => void): void {
  const r = raw.release;
  const ground = raw.groundElevation_m ?? 0;
  if (!isRecord(r) || !isNum(r.altitude_m) || !isNum(ground)) return;
  const ref = r.reference ?? 'AGL';
  if (ref !== 'AGL' && ref !== 'MSL') return;
  const msl = ref === 'AGL' ? r.altitude_m + ground : r.altitude_m;
  const mslText = String(Math.round(msl * 100) / 100); // hide float noise such as 199.60000000000002
  const below: string[] = [];
  list(raw.sites).forEach((s, i) => {
    if (!isRecord(s)) return;
    const elev = s.elevation_m ?? ground;
    if (isNum(elev) && msl <= elev) below.push(`${label(s, i)} (${elev} m MSL)`);
  });
  if (below.length === 0) return;
  const shown =
    below.slice(0, 3).join(', ') + (below.length > 3 ? ` and ${below.length - 3} more sites` : '');
  const asMsl = ref === 'AGL' ? ` (${mslText} m MSL)` : '';
  add(
    'release.altitude_m',
    `is ${r.altitude_m} m ${ref}${asMsl}, not above the ground at ${shown}`,
  );
}

function warningsFor(file: PlanFile): string[] {
  const w: string[] = [];
  if (file.time === undefined) w.push('time is not given; the current time is used');
  const layers = file.winds?.layers ?? [];
  if (layers.length === 0) w.push('winds.layers is empty; calm air is assumed');
  if (layers.some((l, i) => i > 0 && l.altitude_m < layers[i - 1].altitude_m)) {
    w.push('winds.layers are not in altitude order; they are used sorted by altitude');
  }
  if (file.sites.length === 0) w.push('sites is empty; there is nothing to plan');
  (file.safety?.checklist ?? []).forEach((m, i) => {
    // Kept as written (the file is not corrected); readiness counts the item as open.
    if (m.state === 'done' && !m.who?.trim()) {
      w.push(
        `safety.checklist[${i}] is done but who is empty; it counts as open until someone is named`,
      );
    }
  });
  file.variants.forEach((v, i) => {
    if (STEERED.has(v.guidance) && v.controlTime_s === 0) {
      w.push(`variants[${i}].controlTime_s is 0, so this steered variant flies as a passive one`);
    }
  });
  return w;
}

/**
 * Checks a parsed plan file against plan.schema.json and the cross-field rules, reporting every
 * problem at once; on success returns the plan with defaults filled (`opts.now` = default time).
 * Never throws.
 */
export function validatePlan(raw: unknown, opts: { now?: Date } = {}): PlanValidation {
  try {
    // Before anything recursive (schema check, structuredClone) can overflow the stack.
    const deep = nestingIssue(raw);
    if (deep) return { ok: false, errors: [deep] };
    const errors = schemaIssues(raw);
    if (isRecord(raw)) errors.push(...semanticIssues(raw, errors));
    if (errors.length > 0) return { ok: false, errors };
    const file = raw as unknown as PlanFile;
    const plan = resolvePlan(file, opts);
    // Limits across fields that need the model (docs/plan-format.md, "Limits across fields").
    const work = workIssue(plan);
    if (work) return { ok: false, errors: [work] };
    const far = frameLimitIssues(plan);
    if (far.length > 0) return { ok: false, errors: far };
    return { ok: true, plan, warnings: warningsFor(file) };
  } catch (err) {
    const why = err instanceof Error ? err.message : 'unexpected input';
    return { ok: false, errors: [{ path: '', message: `plan could not be checked: ${why}` }] };
  }
}

/** The schema node a house path (e.g. `sites[2].lat`) points to, or undefined. */
function schemaNodeAt(path: string): SchemaNode | undefined {
  let node: SchemaNode | undefined = schema as unknown as SchemaNode;
  const defs = (schema as unknown as { definitions: Record<string, SchemaNode> }).definitions;
  const deref = (n: SchemaNode | undefined): SchemaNode | undefined => {
    const ref = n?.$ref;
    return typeof ref === 'string' ? deref(defs[ref.split('/').pop() ?? '']) : n;
  };
  for (const key of path.match(/[^.[\]]+/g) ?? []) {
    node = deref(node);
    if (!node) return undefined;
    node = /^\d+$/.test(key)
      ? (node.items as SchemaNode | undefined)
      : (node.properties?.[key] as SchemaNode | undefined);
  }
  return deref(node);
}

/**
 * What a numeric field at `path` accepts, in words ("a number between -90 and 90"), for form
 * hints and messages; null when the path is not a number field of the plan schema.
 */
export function allowedRange(path: string): string | null {
  const node = schemaNodeAt(path);
  if (!node || (node.type !== 'number' && node.type !== 'integer')) return null;
  return numberText(node, 'number');
}
