/**
 * Headless Seedfall: plan file in, results out.
 *   npm run --silent plan  -- <plan.json> [--format json|text] [--samples N] [--seed N]
 *   npm run --silent brief -- <plan.json> --out <brief.html> [--pdf <brief.pdf>] [--paper A4|Letter]
 *   npm run --silent export -- <plan.json> --format geojson|kml|gpx|csv [--out <file>] [--bom]
 * Exit codes: 0 done, 1 usage or file error, 2 invalid plan, 3 internal error (one line, no trace).
 *
 * Everything is written through the `CliIO` given to `runCli` and the exit code is returned, never
 * `process.exit()`-ed: output to a pipe is flushed completely before the process ends.
 */
import {
  closeSync,
  constants,
  fstatSync,
  openSync,
  readSync,
  realpathSync,
  writeFileSync,
  writeSync,
} from 'node:fs';
import { resolve } from 'node:path';
import { fileURLToPath } from 'node:url';
import {
  altitudeSweep,
  sweepHeightsAGL,
  planDrop,
  type PlanResult,
  type SweepPoint,
} from './planner';
import { briefHtml, briefSafety, CAUTION_TEXT, formatPlanText } from './brief';
import { planSafety } from './safety';
import { toGeoJSON, toGPX, toKML, toScheduleCSV } from './formats';
import { validatePlan, workIssue, type Plan } from './plan';

type Command = 'plan' | 'brief' | 'export';
type Format = 'json' | 'text' | 'geojson' | 'kml' | 'gpx' | 'csv';

interface Args {
  command: Command;
  file?: string;
  format: Format;
  samples?: number;
  seed?: number;
  out?: string;
  pdf?: string;
  paper: 'A4' | 'Letter';
  /** SITE or SITE:VARIANT for the brief's P(hit)-against-altitude plot. */
  sweep?: string;
  /** CSV export starts with a UTF-8 byte-order mark (for spreadsheets). */
  bom?: boolean;
}

/** Where the CLI writes: the process's stdout/stderr, or a test's buffers. */
export interface CliIO {
  out(text: string): void;
  err(text: string): void;
}

/** Largest plan file read, bytes; a larger file (or an endless device) is refused. */
export const MAX_PLAN_BYTES = 32 * 1024 * 1024;
/** Deepest JSON nesting read; a plan needs 7 levels (zone coordinates). */
export const MAX_JSON_DEPTH = 100;
/** Problems of an invalid plan listed on stderr; the rest are counted. */
export const MAX_LISTED_PROBLEMS = 200;
/** A FIFO or device that gives no data for this long is given up on, ms. */
const READ_IDLE_MS = 10_000;

const USAGE = `usage:
  npm run --silent plan  -- <plan.json> [--format json|text] [--samples N] [--seed N]
  npm run --silent brief -- <plan.json> --out <brief.html> [--pdf <brief.pdf>] [--paper A4|Letter]
                             [--sweep SITE[:VARIANT]]
  npm run --silent export -- <plan.json> --format geojson|kml|gpx|csv [--out <file>] [--bom]
`;

const OPTIONS: Record<Command, string[]> = {
  plan: ['--format', '--samples', '--seed'],
  brief: ['--out', '--pdf', '--paper', '--samples', '--seed', '--sweep'],
  export: ['--format', '--out', '--samples', '--seed', '--bom'],
};

const FORMATS: Record<Command, Format[]> = {
  plan: ['json', 'text'],
  brief: [],
  export: ['geojson', 'kml', 'gpx', 'csv'],
};

/** Ends the command with `code`; `message` (may be '') goes to stderr. */
class CliExit extends Error {
  constructor(
    message: string,
    readonly code: number,
  ) {
    super(message);
  }
}

function fail(message: string, code: number): never {
  throw new CliExit(message, code);
}

// C0/C1 controls, bidirectional overrides and isolates, and BOMs from a file would steer the
// terminal or reorder the line; they are shown as \u{…} instead (newlines between lines kept).
const UNSAFE_FOR_TERMINAL =
  // eslint-disable-next-line no-control-regex -- matching control characters is the point
  /[\u0000-\u0009\u000b-\u001f\u007f-\u009f\u061c\u200e\u200f\u202a-\u202e\u2066-\u2069\ufeff]/g;

/** Text that came from a file, made safe to print on a terminal. */
export function terminalText(text: string): string {
  return text.replace(
    UNSAFE_FOR_TERMINAL,
    (c) => `\\u{${c.codePointAt(0)!.toString(16).toUpperCase().padStart(4, '0')}}`,
  );
}

/** One line, safe for a terminal: newlines shown as \u{000A} too. */
const oneLine = (text: string): string => terminalText(text).replace(/\n/g, '\\u{000A}');

function parseArgs(argv: string[], io: CliIO): Args {
  const commands: Command[] = ['plan', 'brief', 'export'];
  const command = commands.includes(argv[0] as Command) ? (argv.shift() as Command) : 'plan';
  const args: Args = { command, format: command === 'export' ? 'geojson' : 'text', paper: 'A4' };
  for (let i = 0; i < argv.length; i++) {
    const a = argv[i];
    const value = (): string => {
      const v = argv[++i];
      if (v === undefined) fail(`${a} needs a value`, 1);
      return v;
    };
    if (a === '--help' || a === '-h') {
      io.out(USAGE);
      fail('', 0);
    }
    if (a.startsWith('--') && !OPTIONS[command].includes(a)) {
      fail(
        `unknown option ${oneLine(a)} for ${command} (known: ${OPTIONS[command].join(', ')})`,
        1,
      );
    }
    if (a === '--format') {
      const f = value() as Format;
      if (!FORMATS[command].includes(f)) {
        fail(`--format must be ${FORMATS[command].join(', ')} (got "${oneLine(f)}")`, 1);
      }
      args.format = f;
    } else if (a === '--samples' || a === '--seed') {
      const n = Number(value());
      const okSamples = a !== '--samples' || (n >= 1 && n <= 100000);
      const okSeed = a !== '--seed' || (n >= 0 && n <= 4294967295);
      if (!Number.isInteger(n) || !okSamples || !okSeed) {
        fail(
          `${a} must be an integer ${a === '--samples' ? 'between 1 and 100000' : 'between 0 and 4294967295'}`,
          1,
        );
      }
      if (a === '--samples') args.samples = n;
      else args.seed = n;
    } else if (a === '--sweep') {
      args.sweep = value();
    } else if (a === '--bom') {
      args.bom = true;
    } else if (a === '--out') {
      args.out = value();
    } else if (a === '--pdf') {
      args.pdf = value();
    } else if (a === '--paper') {
      const p = value();
      if (p !== 'A4' && p !== 'Letter')
        fail(`--paper must be A4 or Letter (got "${oneLine(p)}")`, 1);
      args.paper = p;
    } else if (args.file === undefined) {
      args.file = a;
    } else {
      fail(`only one plan file, got "${oneLine(args.file)}" and "${oneLine(a)}"`, 1);
    }
  }
  if (!args.file) fail(`no plan file given\n${USAGE}`, 1);
  if (args.bom && args.format !== 'csv') fail('--bom applies to --format csv only', 1);
  if (command === 'brief' && !args.out && !args.pdf)
    fail('brief needs --out <file.html> and/or --pdf <file.pdf>', 1);
  return args;
}

const errCode = (e: unknown): string =>
  oneLine((e as NodeJS.ErrnoException)?.code ?? (e instanceof Error ? e.message : String(e)));

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

/** A character for a message: quoted when printable, else its code point. */
function showChar(c: string): string {
  const cp = c.codePointAt(0)!;
  return /[\p{L}\p{N}\p{P}\p{S}]/u.test(c)
    ? `'${c}'`
    : `U+${cp.toString(16).toUpperCase().padStart(4, '0')}`;
}

/**
 * The first JSON syntax error (RFC 8259) or nesting deeper than MAX_JSON_DEPTH, as a character
 * offset and reason; null when the text is well-formed. Iterative, so any depth is safe to scan.
 */
export function jsonSyntaxError(t: string): { at: number; why: string } | null {
  let i = 0;
  const stack: string[] = [];
  const bad = (why: string) => ({
    at: i,
    why:
      i >= t.length
        ? `${why}, but the file ends`
        : `${why}, found ${showChar(String.fromCodePoint(t.codePointAt(i)!))}`,
  });
  const skip = () => {
    while (i < t.length && (t[i] === ' ' || t[i] === '\t' || t[i] === '\n' || t[i] === '\r')) i++;
  };
  const str = (): { at: number; why: string } | null => {
    i++;
    while (i < t.length) {
      const c = t.charCodeAt(i);
      if (c === 0x22) {
        i++;
        return null;
      }
      if (c < 0x20) return bad('a control character must be escaped inside a string');
      if (c === 0x5c) {
        const e = t[i + 1];
        if (e === 'u' && /^[0-9a-fA-F]{4}$/.test(t.slice(i + 2, i + 6))) i += 6;
        else if (e !== undefined && '"\\/bfnrt'.includes(e)) i += 2;
        else {
          i++;
          return bad('not a valid escape after \\');
        }
      } else i++;
    }
    return bad('a string is not closed');
  };
  const key = () => {
    if (t[i] !== '"') return bad('expected a property name in double quotes');
    const f = str();
    if (f) return f;
    skip();
    if (t[i] !== ':') return bad("expected ':' after the property name");
    i++;
    return null;
  };
  const NUMBER = /-?(?:0|[1-9]\d*)(?:\.\d+)?(?:[eE][+-]?\d+)?/y;
  for (;;) {
    skip();
    const c = t[i];
    if (c === '{' || c === '[') {
      i++;
      skip();
      if (t[i] === (c === '{' ? '}' : ']')) i++;
      else {
        if (stack.length >= MAX_JSON_DEPTH) {
          i--;
          return { at: i, why: `nested deeper than ${MAX_JSON_DEPTH} levels` };
        }
        stack.push(c);
        if (c === '{') {
          const f = key();
          if (f) return f;
        }
        continue;
      }
    } else if (c === '"') {
      const f = str();
      if (f) return f;
    } else if (t.startsWith('true', i)) i += 4;
    else if (t.startsWith('false', i)) i += 5;
    else if (t.startsWith('null', i)) i += 4;
    else {
      NUMBER.lastIndex = i;
      if (!NUMBER.test(t)) return bad('expected a value');
      i = NUMBER.lastIndex;
    }
    // After a value: a comma, a closing bracket, or the end.
    for (;;) {
      skip();
      if (stack.length === 0) return i < t.length ? bad('expected the end of the file') : null;
      const top = stack[stack.length - 1];
      if (t[i] === ',') {
        i++;
        skip();
        if (top === '{') {
          const f = key();
          if (f) return f;
        }
        break;
      }
      if (t[i] === (top === '{' ? '}' : ']')) {
        i++;
        stack.pop();
        continue;
      }
      return bad(top === '{' ? "expected ',' or '}'" : "expected ',' or ']'");
    }
  }
}

/** 1-based line and column (in characters) of offset `at`. */
function lineColumn(text: string, at: number): string {
  let line = 1;
  let start = 0;
  for (let k = text.indexOf('\n'); k >= 0 && k < at; k = text.indexOf('\n', k + 1)) {
    line++;
    start = k + 1;
  }
  return `line ${line}, column ${at - start + 1}`;
}

function readPlan(file: string): { plan: Plan; warnings: string[] } {
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

function write(path: string, text: string): void {
  try {
    writeFileSync(path, text);
  } catch (e) {
    fail(`cannot write ${oneLine(path)}: ${errCode(e)}`, 1);
  }
}

/** The same file as `a`, by real path where both exist (links included), else by resolved path. */
function sameFile(a: string, b: string): boolean {
  const real = (p: string) => {
    try {
      return realpathSync(p);
    } catch {
      return resolve(p);
    }
  };
  return real(a) === real(b);
}

async function main(argv: string[], io: CliIO): Promise<void> {
  const args = parseArgs(argv, io);
  // Writing the brief or an export over the plan itself would lose the plan.
  for (const [flag, out] of [
    ['--out', args.out],
    ['--pdf', args.pdf],
  ] as const) {
    if (out !== undefined && sameFile(out, args.file!)) {
      fail(`${flag} ${oneLine(out)} is the plan file itself; choose another file`, 1);
    }
  }
  const { plan, warnings } = readPlan(args.file!);
  if (args.samples !== undefined) plan.monteCarlo.samples = args.samples;
  if (args.seed !== undefined) plan.monteCarlo.seed = args.seed;
  const work = workIssue(plan);
  if (work) fail(`--samples: ${oneLine(work.message)}`, 2);
  const result: PlanResult = planDrop(plan);
  result.warnings.unshift(...warnings);

  if (args.command === 'plan') {
    if (args.format === 'json') {
      io.out(`${JSON.stringify({ ...result, caution: CAUTION_TEXT }, null, 2)}\n`);
    } else {
      io.out(terminalText(formatPlanText(plan, result)));
    }
    return;
  }

  if (args.command === 'export') {
    // Only GeoJSON and KML carry the hazard area, so only they run the safety analysis.
    const hazard = () => ({ hazardArea: planSafety(plan, result).hazardArea });
    const text =
      args.format === 'geojson'
        ? `${JSON.stringify(toGeoJSON(plan, result, hazard()), null, 1)}\n`
        : args.format === 'kml'
          ? toKML(plan, result, hazard())
          : args.format === 'gpx'
            ? toGPX(plan, result)
            : toScheduleCSV(plan, result, { bom: args.bom });
    if (args.out) write(args.out, text);
    else io.out(text);
    return;
  }

  let sweep: { title: string; points: SweepPoint[] } | undefined;
  if (args.sweep) {
    const [siteId, variantArg] = args.sweep.split(':');
    const site = result.sites.find((x) => x.id === siteId);
    const known = (ids: string[]) => oneLine(ids.join(', '));
    if (!site)
      fail(
        `--sweep: no site "${oneLine(siteId)}" (known: ${known(result.sites.map((x) => x.id))})`,
        1,
      );
    const variantId = variantArg ?? site.variant;
    if (!plan.variants.some((v) => v.id === variantId)) {
      fail(
        `--sweep: no variant "${oneLine(variantId)}" (known: ${known(plan.variants.map((v) => v.id))})`,
        1,
      );
    }
    const heights = sweepHeightsAGL(plan, result.releaseAltitudeMSL_m);
    sweep = {
      title: `${siteId} · ${variantId}`,
      points: altitudeSweep(plan, siteId, variantId, heights),
    };
  }
  const html = briefHtml(plan, result, {
    sweep,
    paper: args.paper,
    safety: briefSafety(planSafety(plan, result)),
  });
  if (args.out) write(args.out, html);
  if (args.pdf) {
    const { printPdf, CHROMIUM_PATH } = await import('./print-pdf');
    try {
      await printPdf(html, args.pdf, args.paper);
    } catch (e) {
      fail(
        `could not print ${oneLine(args.pdf)} with Chromium at ${CHROMIUM_PATH}: ${oneLine((e as Error)?.message?.split('\n')[0] ?? String(e))}`,
        1,
      );
    }
  }
  const written = [args.out, args.pdf].filter((x): x is string => x !== undefined);
  io.err(`seedfall: brief written to ${written.map(oneLine).join(' and ')}\n`);
}

/** First line of an unexpected error, for the one-line "internal error" report. */
function internal(e: unknown): string {
  const msg = e instanceof Error ? `${e.name}: ${e.message}` : String(e);
  return `seedfall: internal error: ${oneLine(msg.split('\n')[0]).slice(0, 300)}\n`;
}

/**
 * Runs one command line (without `node` and the script) and returns its exit code. Never throws;
 * an unexpected error is reported in one line as an internal error (exit 3).
 */
export async function runCli(argv: string[], io: CliIO): Promise<number> {
  try {
    await main([...argv], io);
    return 0;
  } catch (e) {
    if (e instanceof CliExit) {
      if (e.message) io.err(`seedfall: ${e.message}\n`);
      return e.code;
    }
    io.err(internal(e));
    return 3;
  }
}

const isEntry =
  process.argv[1] !== undefined && resolve(process.argv[1]) === fileURLToPath(import.meta.url);

if (isEntry) {
  // A closed pipe (e.g. `| head`) ends the output quietly instead of with a stack trace.
  process.stdout.on('error', (e: NodeJS.ErrnoException) => {
    if (e.code === 'EPIPE') process.exit(0);
    writeSync(2, internal(e));
    process.exit(3);
  });
  process.on('uncaughtException', (e) => {
    writeSync(2, internal(e));
    process.exit(3);
  });
  void runCli(process.argv.slice(2), {
    out: (t) => void process.stdout.write(t),
    err: (t) => void process.stderr.write(t),
  }).then((code) => {
    // Set, not process.exit(): pending writes to a pipe are flushed before the process ends.
    process.exitCode = code;
  });
}
