/// <reference lib="webworker" />
// Reads and parses large import files (sites, soundings) off the main thread, so the page keeps
// responding; the importers stop at the plan's limits (app/formats/import-limits.ts).
import {
  type ImportOptions,
  type ImportResult,
  importSites,
  importSounding,
  type Sounding,
} from '../formats';

export type ImportRequest =
  | {
      id: number;
      kind: 'sites';
      file: Blob;
      opts: Pick<ImportOptions, 'near'> & { existingIds: string[]; variantIds: string[] };
    }
  | { id: number; kind: 'sounding'; file: Blob };

export type ImportReply =
  | { id: number; kind: 'sites'; result: ImportResult }
  | { id: number; kind: 'sounding'; result: Sounding }
  | { id: number; kind: 'error'; message: string };

self.onmessage = async (ev: MessageEvent<ImportRequest>) => {
  const req = ev.data;
  const post = (m: ImportReply): void =>
    (self as unknown as DedicatedWorkerGlobalScope).postMessage(m);
  try {
    const text = await req.file.text();
    if (req.kind === 'sites') {
      const result = importSites(text, 'auto', req.opts);
      post({ id: req.id, kind: 'sites', result });
    } else {
      post({ id: req.id, kind: 'sounding', result: importSounding(text) });
    }
  } catch (e) {
    post({ id: req.id, kind: 'error', message: e instanceof Error ? e.message : String(e) });
  }
};
