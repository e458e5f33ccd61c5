/**
 * Sites read from CSV (RFC 4180 and its everyday variants), GeoJSON (RFC 7946) or KML 2.2.
 * Every row or feature that is not imported is reported with its line or feature index and the
 * reason; good rows are kept. Never throws.
 *
 * KML needs an XML parser: `opts.parseXml` when given, else the platform's DOMParser (browser
 * main thread), else @xmldom/xmldom (Node, Web Workers).
 *
 * Limits follow the importers' one rule (import-limits.ts): reading stops once the plan's site
 * limit is reached ("only the first N sites were read"), a value outside the schema's range keeps
 * its site out with the field and range named, and files over MAX_IMPORT_BYTES are refused.
 */
import { readCSV } from './csv';
import { readGeoJSON } from './geojson';
import {
  fmt,
  MAX_IMPORT_BYTES,
  onlyFirstMessage,
  ProblemList,
  schemaMaxItems,
} from './import-limits';
import { readKML } from './kml';
import { IdPool, type ImportOptions, type ImportResult, type Problems, Sink } from './site-reading';

export type { ImportOptions, ImportProblem, ImportResult, XmlParser } from './site-reading';

/** Reads sites from text: kind 'auto' picks KML for '<…', GeoJSON for '{…' or '[…', else CSV. */
export function importSites(
  text: string,
  kind: 'csv' | 'geojson' | 'kml' | 'auto',
  opts: ImportOptions = {},
): ImportResult {
  const problems: Problems = new ProblemList();
  const ids = new IdPool(opts, problems);
  const max = schemaMaxItems('sites');
  const sink = new Sink(Math.max(0, max - ids.existing), opts.near);
  const raw = String(text ?? '');
  if (raw.length > MAX_IMPORT_BYTES) {
    problems.push({
      message: `the file is larger than ${fmt(MAX_IMPORT_BYTES / 1048576)} MB, the most an import reads; nothing was read`,
    });
    return { sites: [], problems: problems.items };
  }
  try {
    const body = raw.replace(/^\uFEFF/, '');
    const head = body.trimStart()[0];
    const k =
      kind !== 'auto'
        ? kind
        : head === '<'
          ? 'kml'
          : head === '{' || head === '['
            ? 'geojson'
            : 'csv';
    const to = { ids, sink, problems };
    if (k === 'csv') readCSV(body, opts, to);
    else if (k === 'geojson') readGeoJSON(body, to);
    else readKML(body, opts, to);
  } catch (e) {
    problems.push({ message: `the file could not be read: ${(e as Error)?.message ?? String(e)}` });
  }
  const sites = sink.sites;
  const out = problems.items;
  const tail = problems.tail();
  if (tail) out.push({ message: tail });
  if (sink.cut) {
    out.push({
      message:
        sink.room === 0
          ? `the plan already holds ${fmt(max)} sites, the most it can; no sites were read`
          : onlyFirstMessage(sites.length, 'sites', max, ids.existing),
    });
  }
  if (sites.length === 0 && out.length === 0) out.push({ message: 'the file holds no sites' });
  return { sites, problems: out };
}
