// The command line: commands, options and their checks, exit codes, and text made safe for a
// terminal. Exit codes: 0 done, 1 usage or file error, 2 invalid plan, 3 internal error.

export type Command = 'plan' | 'brief' | 'export' | 'timeline';
export type Format = 'json' | 'text' | 'geojson' | 'kml' | 'gpx' | 'csv';

export interface Args {
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
  /** Timeline step, s (--step). */
  step_s?: number;
  /** Elevation model to plan over (--terrain), .tif/.tiff or .asc; overrides the plan's terrain.file. */
  terrain?: string;
}

/** Where the CLI writes: the process's stdout/stderr, or a test's buffers. */
export interface CliIO {
  out(text: string): void;
  err(text: string): void;
}

export const USAGE = `usage:
  npm run --silent plan  -- <plan.json> [--format json|text] [--samples N] [--seed N]
                             [--terrain <dem.tif|dem.asc>]
  npm run --silent brief -- <plan.json> --out <brief.html> [--pdf <brief.pdf>] [--paper A4|Letter]
                             [--sweep SITE[:VARIANT]] [--terrain <dem.tif|dem.asc>]
  npm run --silent export -- <plan.json> --format geojson|kml|gpx|csv [--out <file>] [--bom]
                             [--terrain <dem.tif|dem.asc>]
  npm run --silent timeline -- <plan.json> [--step 5m] [--format json|text] [--samples N]
                             [--terrain <dem.tif|dem.asc>]
--terrain: a GeoTIFF or ESRI ASCII grid of ground heights MSL (m); overrides the plan's
  terrain.file (which is relative to the plan file). Only the window the plan can reach is read.
`;

const OPTIONS: Record<Command, string[]> = {
  plan: ['--format', '--samples', '--seed', '--terrain'],
  brief: ['--out', '--pdf', '--paper', '--samples', '--seed', '--sweep', '--terrain'],
  export: ['--format', '--out', '--samples', '--seed', '--bom', '--terrain'],
  timeline: ['--step', '--format', '--samples', '--seed', '--terrain'],
};

const FORMATS: Record<Command, Format[]> = {
  plan: ['json', 'text'],
  brief: [],
  export: ['geojson', 'kml', 'gpx', 'csv'],
  timeline: ['json', 'text'],
};

/** Allowed timeline steps, s: 1 min to 6 h. */
export const STEP_RANGE_S = { min: 60, max: 6 * 3600 } as const;

/** A duration with its unit ("90s", "5m", "1.5h") in whole seconds, or null when it is not one. */
export function durationSeconds(text: string): number | null {
  const m = /^(\d{1,6}(?:\.\d{1,6})?)([smh])$/.exec(text.trim());
  if (!m) return null;
  const s = Number(m[1]) * { s: 1, m: 60, h: 3600 }[m[2] as 's' | 'm' | 'h'];
  return Number.isInteger(Math.round(s * 1e6) / 1e6) ? Math.round(s) : null;
}

/** Ends the command with `code`; `message` (may be '') goes to stderr. */
export class CliExit extends Error {
  constructor(
    message: string,
    readonly code: number,
  ) {
    super(message);
  }
}

export function fail(message: string, code: number): never {
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
export const oneLine = (text: string): string => terminalText(text).replace(/\n/g, '\\u{000A}');

export function parseArgs(argv: string[], io: CliIO): Args {
  const commands: Command[] = ['plan', 'brief', 'export', 'timeline'];
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
    } else if (a === '--step') {
      const v = value();
      const s = durationSeconds(v);
      if (s === null || s < STEP_RANGE_S.min || s > STEP_RANGE_S.max) {
        fail(
          `--step must be a duration from 1m to 6h in whole seconds, with its unit s, m or h (e.g. 90s, 5m, 1h); got "${oneLine(v)}"`,
          1,
        );
      }
      args.step_s = s;
    } else if (a === '--sweep') {
      args.sweep = value();
    } else if (a === '--terrain') {
      const t = value();
      if (!/\.(tiff?|asc)$/i.test(t)) {
        fail(`--terrain must name a .tif, .tiff or .asc file (got "${oneLine(t)}")`, 1);
      }
      args.terrain = t;
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

export const errCode = (e: unknown): string =>
  oneLine((e as NodeJS.ErrnoException)?.code ?? (e instanceof Error ? e.message : String(e)));
