/**
 * The one rule every importer follows (docs/plan-format.md, "Importing"): limits come from
 * plan.schema.json at run time, so an importer cannot drift from the schema.
 * - More entries than the plan holds: the first ones are kept, reading stops, and the report says
 *   "only the first N sites were read (the plan holds at most M)".
 * - A value outside the schema's range: the plan entry it would go into (a site, a wind layer, a
 *   temperature level) is not made, and the report names the line, the field and the allowed range.
 */
import { allowedRange, planSchema as schema } from '../plan';

/** Largest file any importer reads, bytes: larger ones are refused before reading. */
export const MAX_IMPORT_BYTES = 20 * 1024 * 1024;
/** Files larger than this are parsed in a Web Worker in the app, so the page keeps responding. */
export const WORKER_IMPORT_BYTES = 200 * 1024;
/** Problems listed one by one; beyond this they are counted in one closing line. */
export const MAX_LISTED_PROBLEMS = 200;

type Node = Record<string, unknown>;
const isNum = (x: unknown): x is number => typeof x === 'number' && Number.isFinite(x);

function nodeAt(path: string): Node | undefined {
  const defs = (schema as unknown as { definitions: Record<string, Node> }).definitions;
  const deref = (n: Node | undefined): Node | undefined => {
    const ref = n?.$ref;
    return typeof ref === 'string' ? deref(defs[ref.split('/').pop() ?? '']) : n;
  };
  let node: Node | undefined = schema as unknown as Node;
  // "sites[].lat" and "sites[0].lat" both step into the array's items.
  for (const key of path.match(/\[\]|[^.[\]]+/g) ?? []) {
    node = deref(node);
    if (!node) return undefined;
    node =
      key === '[]' || /^\d+$/.test(key)
        ? (node.items as Node | undefined)
        : ((node.properties as Node | undefined)?.[key] as Node | undefined);
  }
  return deref(node);
}

/** Numeric bounds of the schema field at `path` (e.g. "winds.layers[].speed_mps"). */
export interface Bounds {
  min?: number;
  max?: number;
  exclusiveMin?: number;
  exclusiveMax?: number;
}

const boundsOf = new Map<string, Bounds>();

/** Bounds of a schema field; walked once per path (importers ask for every value they read). */
export function schemaBounds(path: string): Bounds {
  const known = boundsOf.get(path);
  if (known) return known;
  const n = nodeAt(path);
  if (!n) throw new Error(`no schema field at ${path}`);
  const b: Bounds = {};
  if (isNum(n.minimum)) b.min = n.minimum;
  if (isNum(n.maximum)) b.max = n.maximum;
  if (isNum(n.exclusiveMinimum)) b.exclusiveMin = n.exclusiveMinimum;
  if (isNum(n.exclusiveMaximum)) b.exclusiveMax = n.exclusiveMaximum;
  boundsOf.set(path, Object.freeze(b));
  return b;
}

/** The schema's maxItems of the array at `path` ("sites", "winds.layers"). */
export function schemaMaxItems(path: string): number {
  const n = nodeAt(path);
  if (!n || !isNum(n.maxItems)) throw new Error(`no maxItems at ${path}`);
  return n.maxItems;
}

/** The schema's maxLength of the string at `path` ("sites[].name"). */
export function schemaMaxLength(path: string): number {
  const n = nodeAt(path);
  if (!n || !isNum(n.maxLength)) throw new Error(`no maxLength at ${path}`);
  return n.maxLength;
}

/** True when v is a finite number the schema field at `path` accepts. */
export function inSchemaRange(path: string, v: number): boolean {
  const b = schemaBounds(path);
  return (
    Number.isFinite(v) &&
    (b.min === undefined || v >= b.min) &&
    (b.max === undefined || v <= b.max) &&
    (b.exclusiveMin === undefined || v > b.exclusiveMin) &&
    (b.exclusiveMax === undefined || v < b.exclusiveMax)
  );
}

/** Index path form for validate's allowedRange ("sites[0].lat"). */
const indexed = (path: string): string => path.replace(/\[\]/g, '[0]');

/**
 * undefined when the schema field at `path` accepts v, else a sentence naming the field, the value
 * and the allowed range: "speed_mps 102.4 is outside the plan's range (a number between 0 and 100)".
 */
export function rangeProblem(path: string, v: number, shown = v): string | undefined {
  if (inSchemaRange(path, v)) return undefined;
  const field = path.split('.').pop() ?? path;
  const range = allowedRange(indexed(path)) ?? 'a number';
  return `${field} ${fmt(shown)} is outside the plan's range (${range})`;
}

/** Thousands grouped with commas ("1,000"); at most 4 decimals for other numbers. */
export function fmt(n: number): string {
  if (!Number.isFinite(n)) return String(n);
  return Number.isInteger(n) ? n.toLocaleString('en-US') : String(Math.round(n * 10000) / 10000);
}

/** The count message of the rule: "only the first 988 sites were read (the plan holds at most 1,000 …)". */
export function onlyFirstMessage(
  read: number,
  what: string,
  max: number,
  already = 0,
  rest = 'the rest of the file was not read',
): string {
  return (
    `only the first ${fmt(read)} ${what} were read (the plan holds at most ${fmt(max)}` +
    `${already > 0 ? `, ${fmt(already)} already in it` : ''}); ${rest}`
  );
}

/**
 * A problem list that keeps the first MAX_LISTED_PROBLEMS entries and counts the rest, so a
 * damaged million-row file cannot grow memory without bound.
 */
export class ProblemList<T> {
  readonly items: T[] = [];
  dropped = 0;
  push(...ps: T[]): void {
    for (const p of ps) {
      if (this.items.length < MAX_LISTED_PROBLEMS) this.items.push(p);
      else this.dropped++;
    }
  }
  get length(): number {
    return this.items.length + this.dropped;
  }
  /** "… and 12,345 more problems not listed", or undefined when all are listed. */
  tail(): string | undefined {
    return this.dropped > 0 ? `… and ${fmt(this.dropped)} more problems not listed` : undefined;
  }
}
