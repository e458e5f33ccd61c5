import {
  fmt,
  type ImportOptions,
  type ImportResult,
  importSites,
  importSounding,
  MAX_IMPORT_BYTES,
  type Sounding,
  WORKER_IMPORT_BYTES,
} from '../formats';
import type { ImportReply, ImportRequest } from '../worker';
import { errorText } from './safe-storage';

type Req = ImportRequest extends infer R
  ? R extends { id: number }
    ? Omit<R, 'id'>
    : never
  : never;

let nextId = 1;

/** Runs one import in its own worker; rejects with a readable reason when the worker fails. */
function inWorker(req: Req): Promise<ImportReply> {
  return new Promise((resolve, reject) => {
    let worker: Worker;
    try {
      worker = new Worker(new URL('../worker/import-worker.ts', import.meta.url), {
        type: 'module',
      });
    } catch (e) {
      reject(new Error(`the import worker could not start (${errorText(e)})`));
      return;
    }
    const id = nextId++;
    const done = (): void => worker.terminate();
    worker.onmessage = (ev: MessageEvent<ImportReply>) => {
      if (ev.data.id !== id) return;
      done();
      if (ev.data.kind === 'error') reject(new Error(ev.data.message));
      else resolve(ev.data);
    };
    worker.onerror = (ev) => {
      ev.preventDefault();
      done();
      reject(new Error(ev.message || 'the import worker stopped'));
    };
    worker.onmessageerror = () => {
      done();
      reject(new Error('the import worker sent an unreadable answer'));
    };
    worker.postMessage({ ...req, id } as ImportRequest);
  });
}

/** Refusal text for a file over the import size bound, else undefined. */
export function tooLarge(file: Blob): string | undefined {
  return file.size > MAX_IMPORT_BYTES
    ? `the file is ${fmt(Math.round(file.size / 1048576))} MB, larger than the ${fmt(MAX_IMPORT_BYTES / 1048576)} MB an import reads; nothing was read`
    : undefined;
}

/** Sites from a file: in a worker when large (WORKER_IMPORT_BYTES), else on this thread. */
export async function importSitesFile(
  file: Blob,
  opts: Pick<ImportOptions, 'near'> & { existingIds: string[]; variantIds: string[] },
): Promise<ImportResult> {
  if (file.size > WORKER_IMPORT_BYTES) {
    const r = await inWorker({ kind: 'sites', file, opts });
    if (r.kind !== 'sites') throw new Error('the import worker answered another request');
    return r.result;
  }
  return importSites(await file.text(), 'auto', opts);
}

/** A sounding from a file: in a worker when large, else on this thread. */
export async function importSoundingFile(file: Blob): Promise<Sounding> {
  if (file.size > WORKER_IMPORT_BYTES) {
    const r = await inWorker({ kind: 'sounding', file });
    if (r.kind !== 'sounding') throw new Error('the import worker answered another request');
    return r.result;
  }
  return importSounding(await file.text());
}
