/**
 * How a hostile case is judged: an independent reading of the documented ranges
 * (app/plan/plan.schema.json walked here without ajv, so a validator bug cannot hide itself), and
 * the verdicts for CLI runs and importer results. A verdict is a list of failures; empty = held.
 */
import Papa from 'papaparse';
import schemaJson from '../../app/plan/plan.schema.json';

type Json = Record<string, unknown>;
type Node = Json;

export type Category = 'file' | 'ranges' | 'script' | 'scale' | 'import';

/** One hostile case as listed in tests/hostile/cases/manifest.json. */
export interface CaseMeta {
  id: string;
  /** Path under tests/hostile/cases/, or under the run-time folder for large cases. */
  file: string;
  category: Category;
  target: 'cli' | 'sites' | 'winds-aloft' | 'sounding' | 'surface';
  /** One line: what the case probes. */
  probes: string;
  /** Where the case comes from (a standard, a published list, the schema, common practice). */
  source: string;
  /** CLI commands to run (default: plan --format json). */
  runs?: CliRun[];
  /** House path of the mutated field, when one field was changed. */
  path?: string;
  /** Must be refused although the schema walk alone does not show it (a cross-field rule). */
  reject?: true;
  /** Text that must never reach an HTML or XML output unescaped. */
  payload?: string;
  /** Importers: items in the input (rows, features, placemarks, groups). */
  items?: number;
  /** Importers: the input is ambiguous or damaged and must be reported even if items are kept. */
  mustReport?: true;
  /** Generated at run time (large), not committed. */
  large?: true;
  /** Run as its own CLI process, not in a batch. */
  separate?: true;
  /** Importer options (sites: CSV delimiter etc.). */
  options?: Json;
}

export type CliRun = 'plan-json' | 'plan-text' | 'brief' | 'kml' | 'gpx' | 'geojson' | 'csv';

export interface CliOutcome {
  run: CliRun;
  /** Exit code; null when killed. */
  code: number | null;
  stdout: string;
  stderr: string;
  /** Contents of the --out file, if one was written. */
  output?: string;
  timedOut?: boolean;
  /** The runner process died during the case (crash); stderr holds its last output. */
  crashed?: boolean;
}

// ------------------------------------------------------------------ documented ranges

const defs = (schemaJson as unknown as { definitions: Record<string, Node> }).definitions;
const isRecord = (x: unknown): x is Json =>
  typeof x === 'object' && x !== null && !Array.isArray(x);
const deref = (n: Node): Node =>
  typeof n.$ref === 'string' ? deref(defs[n.$ref.split('/').pop()!]) : n;
const child = (p: string, k: string) => (p ? `${p}.${k}` : k);
// RFC 3339 §5.6 date-time (with a zone).
const DATE_TIME = /^\d{4}-\d{2}-\d{2}[Tt ]\d{2}:\d{2}:\d{2}(?:\.\d+)?(?:[Zz]|[+-]\d{2}:\d{2})$/;

/**
 * Every place where `value` leaves the documented schema (type, range, length, count, required
 * and unknown fields, enum, pattern); '' paths mean the plan itself. Independent of ajv.
 */
export function schemaViolations(
  value: unknown,
  node: Node = schemaJson as Node,
  path = '',
): string[] {
  const out: string[] = [];
  walk(value, node, path, out, 0);
  return out;
}

function walk(v: unknown, node: Node, p: string, out: string[], depth: number): void {
  if (out.length >= 50) return;
  const n = deref(node);
  const at = p || 'plan';
  if (depth > 200) {
    out.push(`${at}: nested deeper than any plan field`);
    return;
  }
  if ('const' in n && v !== n.const) out.push(`${at}: must be ${JSON.stringify(n.const)}`);
  if (Array.isArray(n.enum) && !n.enum.includes(v)) out.push(`${at}: not one of the enum`);
  if (isRecord(n.not)) {
    const inside: string[] = [];
    walk(v, n.not, p, inside, depth + 1);
    if (inside.length === 0)
      out.push(`${at}: inside a range the schema excludes (below the least usable value)`);
  }
  switch (n.type) {
    case 'number':
    case 'integer': {
      if (typeof v !== 'number' || !Number.isFinite(v)) {
        out.push(`${at}: not a finite number`);
        return;
      }
      if (n.type === 'integer' && !Number.isInteger(v)) out.push(`${at}: not an integer`);
      if (typeof n.minimum === 'number' && v < n.minimum) out.push(`${at}: below ${n.minimum}`);
      if (typeof n.maximum === 'number' && v > n.maximum) out.push(`${at}: above ${n.maximum}`);
      if (typeof n.exclusiveMinimum === 'number' && v <= n.exclusiveMinimum)
        out.push(`${at}: not above ${n.exclusiveMinimum}`);
      if (typeof n.exclusiveMaximum === 'number' && v >= n.exclusiveMaximum)
        out.push(`${at}: not below ${n.exclusiveMaximum}`);
      return;
    }
    case 'string': {
      if (typeof v !== 'string') {
        out.push(`${at}: not a string`);
        return;
      }
      const len = [...v].length;
      if (typeof n.minLength === 'number' && len < n.minLength) out.push(`${at}: too short`);
      if (typeof n.maxLength === 'number' && len > n.maxLength) out.push(`${at}: too long`);
      if (typeof n.pattern === 'string' && !new RegExp(n.pattern, 'u').test(v))
        out.push(`${at}: does not match the id pattern`);
      if (n.format === 'date-time' && (!DATE_TIME.test(v) || Number.isNaN(Date.parse(v))))
        out.push(`${at}: not an RFC 3339 date-time`);
      return;
    }
    case 'array': {
      if (!Array.isArray(v)) {
        out.push(`${at}: not an array`);
        return;
      }
      if (typeof n.minItems === 'number' && v.length < n.minItems) out.push(`${at}: too few items`);
      if (typeof n.maxItems === 'number' && v.length > n.maxItems)
        out.push(`${at}: too many items`);
      const items = n.items as Node | Node[] | undefined;
      v.forEach((x, i) => {
        const itemNode = Array.isArray(items) ? (items[i] ?? (n.additionalItems as Node)) : items;
        if (isRecord(itemNode)) walk(x, itemNode, `${p}[${i}]`, out, depth + 1);
      });
      return;
    }
    case 'object': {
      if (!isRecord(v)) {
        out.push(`${at}: not an object`);
        return;
      }
      const props = (n.properties ?? {}) as Record<string, Node>;
      for (const r of (n.required as string[] | undefined) ?? []) {
        if (!Object.prototype.hasOwnProperty.call(v, r)) out.push(`${child(p, r)}: missing`);
      }
      for (const k of Object.keys(v)) {
        if (Object.prototype.hasOwnProperty.call(props, k))
          walk(v[k], props[k], child(p, k), out, depth + 1);
        else if (n.additionalProperties === false) out.push(`${child(p, k)}: unknown field`);
      }
      return;
    }
    default:
      return;
  }
}

// ------------------------------------------------------------------ CLI verdicts

/** Native crashes, V8 fatal errors and JavaScript stack traces: never shown to a user. */
const TRACE =
  /^\s+at \S|FATAL ERROR|==== JS stack trace|Native stack trace|Segmentation fault|internal error/m;

/** Result keys that may hold null by contract (README: releaseWindow or releaseZone; no declination model). */
const NULLABLE = new Set([
  'releaseWindow',
  'releaseZone',
  'headingMag_deg',
  'declination_deg',
  'declinationModel',
]);

function nullsWhereNumbers(x: unknown, path: string, out: string[]): void {
  if (out.length >= 5) return;
  if (Array.isArray(x)) x.forEach((y, i) => nullsWhereNumbers(y, `${path}[${i}]`, out));
  else if (isRecord(x)) {
    for (const [k, y] of Object.entries(x)) {
      const p = child(path, k);
      if (y === null && !NULLABLE.has(k)) out.push(p);
      else nullsWhereNumbers(y, p, out);
    }
  }
}

const isLatLon = (q: unknown): boolean =>
  isRecord(q) &&
  typeof q.lat === 'number' &&
  typeof q.lon === 'number' &&
  Math.abs(q.lat) <= 90 &&
  Math.abs(q.lon) <= 180;

/** Failures of a `plan --format json` result: nulls (NaN/Infinity) where numbers are promised, landings off the globe. */
function judgePlanJson(stdout: string): string[] {
  let r: Json;
  try {
    r = JSON.parse(stdout) as Json;
  } catch {
    return ['exit 0 but stdout is not JSON'];
  }
  const out: string[] = [];
  const nulls: string[] = [];
  nullsWhereNumbers(r, '', nulls);
  if (nulls.length)
    out.push(`null (NaN or Infinity) where a number is promised: ${nulls.join(', ')}`);
  const sites = Array.isArray(r.sites) ? (r.sites as Json[]) : [];
  for (const s of sites) {
    const e95 = s.ellipse95 as Json | undefined;
    if (!isLatLon(s.nominalLanding) || !isLatLon(e95?.center)) {
      out.push(`site ${JSON.stringify(s.id)}: landing is not a finite position on the globe`);
      break;
    }
  }
  return out;
}

/** The payload must not appear as markup: unescaped in HTML/XML output. */
function rawPayload(text: string, payload: string | undefined): boolean {
  return payload !== undefined && /[<>"&]/.test(payload) && text.includes(payload);
}

/** OWASP CSV Injection: a cell that a spreadsheet would run as a formula. */
export function formulaCells(csv: string): string[] {
  const parsed = Papa.parse<string[]>(csv.replace(/^\uFEFF/, ''), { skipEmptyLines: true });
  const bad: string[] = [];
  for (const row of parsed.data) {
    for (const cell of row) {
      if (/^[=+\-@\t\r]/.test(cell) && !/^[+-]?\d+(\.\d+)?([eE][+-]?\d+)?$/.test(cell))
        bad.push(cell);
    }
  }
  return bad;
}

/** Problem lines of an invalid-plan report ("  - …"). */
const problemLines = (stderr: string) =>
  stderr
    .split('\n')
    .filter((l) => l.startsWith('  - '))
    .map((l) => l.slice(4));
const PATH_FIRST = /^(plan|[A-Za-z_$][\w$]*(\[\d+\])*(\.[A-Za-z_$][\w$]*(\[\d+\])*)*)( |$)/;

/**
 * Failures of one CLI run. Holds when: exit 0 with finite results (and the plan within its
 * documented ranges), exit 2 with every problem naming a field path (range problems with their
 * range) or a JSON syntax error with its line and column, or exit 1 with a one-line file error.
 */
export function judgeCli(c: CaseMeta, o: CliOutcome, mustReject: string[]): string[] {
  const f: string[] = [];
  const tail = o.stderr.trim().split('\n').slice(-2).join(' | ').slice(0, 300);
  if (o.timedOut) return [`${o.run}: hang: no answer within 20 s of CPU time (60 s of wall time)`];
  if (o.crashed) return [`${o.run}: crash (runner died, exit ${o.code}): ${tail}`];
  if (TRACE.test(o.stderr)) f.push(`${o.run}: stack trace or internal error on stderr: ${tail}`);
  if (o.code === 0) {
    if (mustReject.length)
      f.push(`${o.run}: silent acceptance (exit 0) of ${mustReject.slice(0, 3).join('; ')}`);
    if (o.run === 'plan-json') f.push(...judgePlanJson(o.stdout).map((x) => `${o.run}: ${x}`));
    const text = o.output ?? o.stdout;
    if (o.run === 'brief' || o.run === 'kml' || o.run === 'gpx') {
      if (rawPayload(text, c.payload)) f.push(`${o.run}: the payload reaches the output unescaped`);
    }
    if (o.run === 'brief' || o.run === 'plan-text') {
      const visible = text.replace(/<style[\s\S]*?<\/style>/g, '').replace(/<[^>]*>/g, ' ');
      const m = /\b(NaN|Infinity|undefined|null)\b/.exec(visible);
      if (m) f.push(`${o.run}: prints "${m[1]}"`);
    }
    if (o.run === 'csv') {
      const cells = formulaCells(text);
      if (cells.length) f.push(`csv: formula cells ${JSON.stringify(cells.slice(0, 3))}`);
    }
    if (o.run === 'geojson') {
      try {
        JSON.parse(text);
      } catch {
        f.push('geojson: output is not JSON');
      }
    }
    return f;
  }
  if (o.code === 2) {
    const lines = problemLines(o.stderr);
    if (lines.length === 0) {
      const first = o.stderr.split('\n')[0];
      if (
        !/not valid JSON: .* at line \d+, column \d+$|is empty: .*line 1, column 1$/.test(first)
      ) {
        f.push(`exit 2 without problems or a syntax position: ${tail}`);
      }
      return f;
    }
    const unnamed = lines.filter(
      (l) => !PATH_FIRST.test(l) || /^plan could not be checked/.test(l),
    );
    if (unnamed.length) f.push(`problems naming no field: ${JSON.stringify(unnamed.slice(0, 2))}`);
    if (c.path && mustReject.some((m) => m.startsWith(`${c.path}:`)) && !c.reject) {
      const own = lines.find((l) => l.startsWith(`${c.path} `));
      const outOfRange = mustReject.some(
        (m) => m.startsWith(`${c.path}:`) && /below|above/.test(m),
      );
      if (!own) f.push(`no problem names ${c.path}`);
      else if (outOfRange && !/\d/.test(own))
        f.push(`${c.path}: problem gives no allowed range: ${own}`);
    }
    return f;
  }
  if (o.code === 1) {
    const lines = o.stderr.trim().split('\n');
    if (lines.length !== 1 || !lines[0].startsWith('seedfall: '))
      f.push(`exit 1 not as one line: ${tail}`);
    return f;
  }
  return [...f, `${o.run}: exit ${o.code} (expected 0, 1 or 2): ${tail}`];
}

/** What must make a plan case refused: schema violations, or the case's own rule. */
export function mustRejectOf(c: CaseMeta, text: string | null): string[] {
  if (text === null) return ['not a plan file'];
  let raw: unknown;
  try {
    raw = JSON.parse(text.replace(/^\uFEFF/, ''));
  } catch {
    return ['not JSON'];
  }
  const v = schemaViolations(raw);
  if (c.reject) v.push(`${c.path ?? 'plan'}: ${c.probes}`);
  return v;
}

// ------------------------------------------------------------------ importer verdicts

export interface ImportOutcome {
  threw?: string;
  kept: number;
  /** Problem messages, with their line or feature when located. */
  problems: { where?: string; message: string; covers?: number }[];
  /** validatePlan errors of the demo plan with the import put in (first few). */
  planErrors: string[];
  timedOut?: boolean;
  crashed?: boolean;
  crash?: string;
}

/**
 * How many dropped items a problem accounts for: the runner's own count, everything after a
 * cut ("only the first 1,000 sites were read"), a count in an unlocated message ("3 level(s) …
 * left out"), else one.
 */
function covered(p: ImportOutcome['problems'][number]): number {
  if (p.covers !== undefined) return p.covers;
  if (/only the first \d|(?:was|were) not read/.test(p.message)) return Infinity;
  const m =
    /(\d[\d,]*)\s+(?:more\s+|extra\s+)?(?:level|group|row|site|layer|placemark|feature|item|line)/i.exec(
      p.message,
    );
  return m && !p.where ? Number(m[1].replace(/,/g, '')) : 1;
}

/** Holds when the importer returns, its output validates inside the demo plan, and every dropped item is reported. */
export function judgeImport(c: CaseMeta, o: ImportOutcome): string[] {
  if (o.timedOut) return ['hang: no answer within 20 s of CPU time (60 s of wall time)'];
  if (o.crashed) return [`crash: ${o.crash ?? ''}`.slice(0, 300)];
  if (o.threw) return [`threw: ${o.threw}`];
  const f: string[] = [];
  if (o.planErrors.length)
    f.push(`import makes the plan invalid: ${o.planErrors.slice(0, 2).join('; ')}`);
  if (c.items !== undefined && o.kept < c.items) {
    const reported = o.problems.reduce((n, p) => n + covered(p), 0);
    // A file refused whole with a reason reports every item in it.
    const refused = o.kept === 0 && o.problems.length > 0;
    if (!refused && o.kept + reported < c.items) {
      f.push(`${c.items - o.kept} of ${c.items} items dropped, ${reported} reported`);
    }
  }
  if (c.mustReport && o.problems.length === 0) f.push('damaged input taken without a word');
  return f;
}
