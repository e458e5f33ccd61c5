// What every site reader shares (import-sites.ts, csv.ts, geojson.ts, kml.ts): the result types,
// where read sites go, ids, and the checks of field values against the plan schema.
import { distance_m } from '../model';
import { planSchema as schema, type Site } from '../plan';
import { ProblemList, rangeProblem, schemaMaxLength } from './import-limits';

export interface ImportProblem {
  /** 1-based line of the text (CSV rows, XML and JSON syntax errors). */
  line?: number;
  /** 0-based index into the GeoJSON features (or KML placemarks in document order). */
  feature?: number;
  message: string;
}

export interface ImportResult {
  sites: Site[];
  problems: ImportProblem[];
}

/** Parses XML text into a DOM Document; errors are thrown or reported as <parsererror>. */
export type XmlParser = (text: string) => Document;

export interface ImportOptions {
  /** Ids already in the plan: generated ids avoid them and imported ids that collide are renamed. */
  existingIds?: Iterable<string>;
  /** Variant ids of the plan; a site naming another variant is imported without it (reported). */
  variantIds?: Iterable<string>;
  /** CSV delimiter; detected from the first line when absent. */
  delimiter?: ',' | ';' | '\t';
  /** XML parser for KML (see the module comment). */
  parseXml?: XmlParser;
  /**
   * The plan's release point and how far from it sites may lie (the plan's limit across fields,
   * FRAME_LIMIT_M in plan-limits.ts): farther sites are not imported, with the distance and, when
   * swapping latitude and longitude would bring them in range, that hint.
   */
  near?: { lat: number; lon: number; maxDistance_m: number };
}

export type Problems = ProblemList<ImportProblem>;

/** Where a reader puts what it reads: ids handed out, sites kept, problems reported. */
export interface ReadTarget {
  ids: IdPool;
  sink: Sink;
  problems: Problems;
}
export type Where = { line?: number; feature?: number };

/** Where read sites go: at most `room` of them (the plan's limit less the sites it has). */
export class Sink {
  readonly sites: Site[] = [];
  /** Set when more sites followed after the sink was full: reading stopped there. */
  cut = false;
  constructor(
    readonly room: number,
    private near?: ImportOptions['near'],
  ) {}
  /** Why a position cannot be a site of this plan (too far from the release), or undefined. */
  tooFar(p: { lat: number; lon: number }, order?: string): string | undefined {
    const n = this.near;
    if (!n) return undefined;
    const d = distance_m(n, p);
    if (d <= n.maxDistance_m) return undefined;
    const km = (m: number) => `${(m / 1000).toFixed(1)} km`;
    const swapped = { lat: p.lon, lon: p.lat };
    const hint =
      Math.abs(swapped.lat) <= 90 && distance_m(n, swapped) <= n.maxDistance_m
        ? ` — latitude and longitude swapped?${order ? ` (${order})` : ''}`
        : '';
    return `the site is ${km(d)} from the release point; the plan holds sites within ${km(n.maxDistance_m)} of it${hint}`;
  }
  /** False (and `cut` set) when the plan has no room for another site. */
  accepts(): boolean {
    if (this.sites.length < this.room) return true;
    this.cut = true;
    return false;
  }
}

// Plan schema "id": its pattern and length, read from the schema.
export const ID_RE = new RegExp(schema.definitions.id.pattern, 'u');
export const ID_MAX = schemaMaxLength('sites[].id');
export const NAME_MAX = schemaMaxLength('sites[].name');

export class IdPool {
  private taken = new Set<string>();
  private next = 1;
  private variants?: Set<string>;
  /** How many sites the plan holds already (one per existing id given). */
  readonly existing: number = 0;
  constructor(
    opts: ImportOptions,
    private problems: Problems,
  ) {
    for (const id of opts.existingIds ?? []) {
      this.taken.add(id);
      this.existing++;
    }
    if (opts.variantIds) this.variants = new Set(opts.variantIds);
  }
  private fresh(): string {
    for (;;) {
      const id = `s${String(this.next++).padStart(2, '0')}`;
      if (!this.taken.has(id)) return id;
    }
  }
  /** A unique valid id: the wanted one when free and valid, else a generated sNN (reported). */
  claim(wanted: string | undefined, where: Where, fromName = false): string {
    let id: string;
    const w = wanted?.trim();
    if (!w) id = this.fresh();
    else if (w.length > ID_MAX || !ID_RE.test(w)) {
      id = this.fresh();
      if (!fromName)
        this.report(
          where,
          `id "${clip(w)}" is not usable (1–${ID_MAX} printable characters); imported as "${id}"`,
        );
    } else if (this.taken.has(w)) {
      id = this.fresh();
      if (!fromName) this.report(where, `id "${clip(w)}" is already taken; imported as "${id}"`);
    } else id = w;
    this.taken.add(id);
    return id;
  }
  variant(v: string | undefined, where: Where): string | undefined {
    const t = v?.trim();
    if (!t) return undefined;
    if (this.variants && !this.variants.has(t)) {
      this.report(
        where,
        `variant "${clip(t)}" is not in the plan; the site is imported without a pinned variant`,
      );
      return undefined;
    }
    if (!ID_RE.test(t) || t.length > ID_MAX) {
      this.report(where, `variant "${clip(t)}" is not a usable id; ignored`);
      return undefined;
    }
    return t;
  }
  report(where: Where, message: string): void {
    this.problems.push({ ...where, message: `${label(where)}: ${message}` });
  }
}

export const clip = (s: string, n = 40): string => (s.length > n ? `${s.slice(0, n)}…` : s);
export const label = (w: Where): string =>
  w.line !== undefined
    ? `line ${w.line}`
    : w.feature !== undefined
      ? `features[${w.feature}]`
      : 'file';

export const NUM_RE = /^[+-]?(?:\d+\.?\d*|\.\d+)(?:e[+-]?\d+)?$/i;

/** A number cell: plain decimal, or with a decimal comma when the delimiter is ';' or tab. */
export function toNumber(cell: string, decimalComma: boolean): number | undefined {
  let t = cell.trim().replace(/^\u2212/, '-');
  if (decimalComma && /^[+-]?\d*,\d+$/.test(t)) t = t.replace(',', '.');
  return NUM_RE.test(t) ? Number(t) : undefined;
}

export type Value<T> = { ok: true; value: T } | { ok: false; message: string };

/** Optional numeric site field, checked against the plan schema's range. */
export function optionalNumber(
  raw: unknown,
  what: 'elevation_m' | 'tolerance_m',
  decimalComma: boolean,
): Value<number | undefined> {
  if (raw === undefined || raw === null || (typeof raw === 'string' && raw.trim() === ''))
    return { ok: true, value: undefined };
  const v =
    typeof raw === 'number'
      ? raw
      : typeof raw === 'string'
        ? toNumber(raw, decimalComma)
        : undefined;
  if (v === undefined || !Number.isFinite(v))
    return { ok: false, message: `${what} "${clip(String(raw))}" is not a number` };
  const bad = rangeProblem(`sites[].${what}`, v);
  return bad ? { ok: false, message: bad } : { ok: true, value: v };
}

export function checkLatLon(
  lat: number,
  lon: number,
  latText = String(lat),
  lonText = String(lon),
): string | undefined {
  if (!Number.isFinite(lat)) return `latitude "${clip(latText)}" is not a number`;
  if (!Number.isFinite(lon)) return `longitude "${clip(lonText)}" is not a number`;
  return rangeProblem('sites[].lat', lat) ?? rangeProblem('sites[].lon', lon);
}
