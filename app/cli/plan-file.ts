// Reading the plan file with bounds (size, idle device, encoding, JSON syntax, schema) and
// writing outputs without overwriting the plan.
import {
  closeSync,
  constants,
  fstatSync,
  openSync,
  readSync,
  realpathSync,
  writeFileSync,
} from 'node:fs';
import { resolve } from 'node:path';
import { MAX_PLAN_BYTES, validatePlan, type Plan } from '../plan';
import { CliExit, errCode, fail, oneLine } from './args';
import { jsonSyntaxError, lineColumn } from './json-syntax';

export { MAX_PLAN_BYTES };
/** Problems of an invalid plan listed on stderr; the rest are counted. */
export const MAX_LISTED_PROBLEMS = 200;
/** A FIFO or device that gives no data for this long is given up on, ms. */
const READ_IDLE_MS = 10_000;

const sleep = (ms: number): void => {
  Atomics.wait(new Int32Array(new SharedArrayBuffer(4)), 0, 0, ms);
};

/**
 * The file's bytes, at most MAX_PLAN_BYTES: read in chunks so an endless device (/dev/zero) or a
 * FIFO stops at the bound; opened non-blocking so a FIFO without a writer cannot hang the open.
 */
function readBounded(file: string, shown: string): Buffer {
  let fd: number;
  try {
    fd = openSync(file, constants.O_RDONLY | constants.O_NONBLOCK);
  } catch (e) {
    fail(`cannot read ${shown}: ${errCode(e)}`, 1);
  }
  const mib = MAX_PLAN_BYTES / 1024 / 1024;
  try {
    const st = fstatSync(fd);
    if (st.isDirectory()) fail(`${shown} is a directory, not a plan file`, 1);
    if (st.isFile() && st.size > MAX_PLAN_BYTES) {
      fail(
        `${shown} is ${(st.size / 1024 / 1024).toFixed(1)} MiB; a plan file may be at most ${mib} MiB`,
        1,
      );
    }
    const chunks: Buffer[] = [];
    let total = 0;
    let idleSince = Date.now();
    for (;;) {
      const chunk = Buffer.allocUnsafe(1 << 20);
      let n: number;
      try {
        n = readSync(fd, chunk, 0, chunk.length, null);
      } catch (e) {
        if ((e as NodeJS.ErrnoException).code !== 'EAGAIN') throw e;
        if (Date.now() - idleSince > READ_IDLE_MS) {
          fail(`${shown} gave no data for ${READ_IDLE_MS / 1000} s; stopped reading`, 1);
        }
        sleep(20);
        continue;
      }
      if (n === 0) break;
      idleSince = Date.now();
      total += n;
      if (total > MAX_PLAN_BYTES) {
        fail(`${shown} is larger than ${mib} MiB, the most a plan file may be; stopped reading`, 1);
      }
      chunks.push(chunk.subarray(0, n));
    }
    return Buffer.concat(chunks, total);
  } catch (e) {
    if (e instanceof CliExit) throw e;
    fail(`cannot read ${shown}: ${errCode(e)}`, 1);
  } finally {
    closeSync(fd);
  }
}

/** Byte offset of the first byte that breaks UTF-8 (RFC 3629), or -1. */
function firstBadUtf8(b: Buffer): number {
  let i = 0;
  while (i < b.length) {
    const c = b[i];
    if (c < 0x80) {
      i++;
      continue;
    }
    const n =
      c >= 0xc2 && c <= 0xdf ? 1 : c >= 0xe0 && c <= 0xef ? 2 : c >= 0xf0 && c <= 0xf4 ? 3 : -1;
    if (n < 0) return i;
    for (let k = 1; k <= n; k++) if (i + k >= b.length || (b[i + k] & 0xc0) !== 0x80) return i;
    // Overlong 3/4-byte forms, UTF-16 surrogates, code points above U+10FFFF.
    const c1 = b[i + 1];
    if (
      (c === 0xe0 && c1 < 0xa0) ||
      (c === 0xed && c1 > 0x9f) ||
      (c === 0xf0 && c1 < 0x90) ||
      (c === 0xf4 && c1 > 0x8f)
    )
      return i;
    i += n + 1;
  }
  return -1;
}

/** Plan text from bytes: UTF-8 with an optional byte-order mark (as the site importers accept). */
function decodePlanText(bytes: Buffer, shown: string): string {
  if ((bytes[0] === 0xff && bytes[1] === 0xfe) || (bytes[0] === 0xfe && bytes[1] === 0xff)) {
    fail(`${shown} is UTF-16 text; save it as UTF-8`, 1);
  }
  const bad = firstBadUtf8(bytes);
  if (bad >= 0) {
    const line = bytes.subarray(0, bad).toString('latin1').split('\n').length;
    fail(`${shown} is not UTF-8 text (line ${line}, byte ${bad + 1}); save it as UTF-8`, 1);
  }
  const text = bytes.toString('utf8');
  return text.charCodeAt(0) === 0xfeff ? text.slice(1) : text;
}

export function readPlan(file: string): { plan: Plan; warnings: string[] } {
  const shown = oneLine(file);
  const text = decodePlanText(readBounded(file, shown), shown);
  if (text.trim() === '') fail(`${shown} is empty: expected a JSON object at line 1, column 1`, 2);
  const syntax = jsonSyntaxError(text);
  if (syntax) {
    fail(`${shown} is not valid JSON: ${syntax.why} at ${lineColumn(text, syntax.at)}`, 2);
  }
  let raw: unknown;
  try {
    raw = JSON.parse(text);
  } catch (e) {
    fail(`${shown} is not valid JSON: ${oneLine((e as Error).message).slice(0, 200)}`, 2);
  }
  const checked = validatePlan(raw);
  if (!checked.ok) {
    const n = checked.errors.length;
    const listed = checked.errors.slice(0, MAX_LISTED_PROBLEMS);
    const lines = listed.map((e) => `  - ${oneLine(e.message)}`);
    if (n > listed.length) lines.push(`  … and ${n - listed.length} more problems`);
    fail(
      `${shown} is not a valid plan (${n} ${n === 1 ? 'problem' : 'problems'}):\n${lines.join('\n')}`,
      2,
    );
  }
  return { plan: checked.plan, warnings: checked.warnings };
}

export function write(path: string, text: string): void {
  try {
    writeFileSync(path, text);
  } catch (e) {
    fail(`cannot write ${oneLine(path)}: ${errCode(e)}`, 1);
  }
}

/** The same file as `a`, by real path where both exist (links included), else by resolved path. */
export function sameFile(a: string, b: string): boolean {
  const real = (p: string) => {
    try {
      return realpathSync(p);
    } catch {
      return resolve(p);
    }
  };
  return real(a) === real(b);
}
