/**
 * Headless Seedfall: plan file in, results out.
 *   npm run --silent plan  -- <plan.json> [--format json|text] [--samples N] [--seed N]
 *   npm run --silent brief -- <plan.json> --out <brief.html> [--pdf <brief.pdf>] [--paper A4|Letter]
 *   npm run --silent export -- <plan.json> --format geojson|kml|gpx|csv [--out <file>]
 * Exit codes: 0 done, 1 usage or file error, 2 invalid plan.
 */
import { readFileSync, writeFileSync } from 'node:fs';
import {
  altitudeSweep,
  sweepHeightsAGL,
  briefHtml,
  briefSafety,
  CAUTION_TEXT,
  formatPlanText,
  planDrop,
  planSafety,
  toGeoJSON,
  toGPX,
  toKML,
  toScheduleCSV,
  validatePlan,
  type Plan,
  type PlanResult,
  type SweepPoint,
} from './core/index';

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
}

const USAGE = `usage:
  npm run --silent plan  -- <plan.json> [--format json|text] [--samples N] [--seed N]
  npm run --silent brief -- <plan.json> --out <brief.html> [--pdf <brief.pdf>] [--paper A4|Letter]
                             [--sweep SITE[:VARIANT]]
  npm run --silent export -- <plan.json> --format geojson|kml|gpx|csv [--out <file>]
`;

const OPTIONS: Record<Command, string[]> = {
  plan: ['--format', '--samples', '--seed'],
  brief: ['--out', '--pdf', '--paper', '--samples', '--seed', '--sweep'],
  export: ['--format', '--out', '--samples', '--seed'],
};

const FORMATS: Record<Command, Format[]> = {
  plan: ['json', 'text'],
  brief: [],
  export: ['geojson', 'kml', 'gpx', 'csv'],
};

function fail(message: string, code: number): never {
  process.stderr.write(`seedfall: ${message}\n`);
  process.exit(code);
}

function parseArgs(argv: string[]): Args {
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
      process.stdout.write(USAGE);
      process.exit(0);
    }
    if (a.startsWith('--') && !OPTIONS[command].includes(a)) {
      fail(`unknown option ${a} for ${command} (known: ${OPTIONS[command].join(', ')})`, 1);
    }
    if (a === '--format') {
      const f = value() as Format;
      if (!FORMATS[command].includes(f)) {
        fail(`--format must be ${FORMATS[command].join(', ')} (got "${f}")`, 1);
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
    } else if (a === '--out') {
      args.out = value();
    } else if (a === '--pdf') {
      args.pdf = value();
    } else if (a === '--paper') {
      const p = value();
      if (p !== 'A4' && p !== 'Letter') fail(`--paper must be A4 or Letter (got "${p}")`, 1);
      args.paper = p;
    } else if (args.file === undefined) {
      args.file = a;
    } else {
      fail(`only one plan file, got "${args.file}" and "${a}"`, 1);
    }
  }
  if (!args.file) fail(`no plan file given\n${USAGE}`, 1);
  if (command === 'brief' && !args.out && !args.pdf)
    fail('brief needs --out <file.html> and/or --pdf <file.pdf>', 1);
  return args;
}

function readPlan(file: string): { plan: Plan; warnings: string[] } {
  let text: string;
  try {
    text = readFileSync(file, 'utf8');
  } catch (e) {
    fail(`cannot read ${file}: ${(e as NodeJS.ErrnoException).code ?? String(e)}`, 1);
  }
  let raw: unknown;
  try {
    raw = JSON.parse(text);
  } catch (e) {
    fail(`${file} is not valid JSON: ${(e as Error).message}`, 2);
  }
  const checked = validatePlan(raw);
  if (!checked.ok) {
    const lines = checked.errors.map((e) => `  - ${e.message}`).join('\n');
    fail(`${file} is not a valid plan (${checked.errors.length} problem(s)):\n${lines}`, 2);
  }
  return { plan: checked.plan, warnings: checked.warnings };
}

function write(path: string, text: string): void {
  try {
    writeFileSync(path, text);
  } catch (e) {
    fail(`cannot write ${path}: ${(e as NodeJS.ErrnoException).code ?? String(e)}`, 1);
  }
}

// A closed pipe (e.g. `| head`) ends the output quietly instead of with a stack trace.
process.stdout.on('error', (e: NodeJS.ErrnoException) => {
  if (e.code === 'EPIPE') process.exit(0);
  throw e;
});

async function main(): Promise<void> {
  const args = parseArgs(process.argv.slice(2));
  const { plan, warnings } = readPlan(args.file!);
  if (args.samples !== undefined) plan.monteCarlo.samples = args.samples;
  if (args.seed !== undefined) plan.monteCarlo.seed = args.seed;
  const result: PlanResult = planDrop(plan);
  result.warnings.unshift(...warnings);

  if (args.command === 'plan') {
    if (args.format === 'json') {
      process.stdout.write(`${JSON.stringify({ ...result, caution: CAUTION_TEXT }, null, 2)}\n`);
    } else {
      process.stdout.write(formatPlanText(plan, result));
    }
    return;
  }

  if (args.command === 'export') {
    const safety = planSafety(plan, result);
    const text =
      args.format === 'geojson'
        ? `${JSON.stringify(toGeoJSON(plan, result, { hazardArea: safety.hazardArea }), null, 1)}\n`
        : args.format === 'kml'
          ? toKML(plan, result, { hazardArea: safety.hazardArea })
          : args.format === 'gpx'
            ? toGPX(plan, result)
            : toScheduleCSV(plan, result);
    if (args.out) write(args.out, text);
    else process.stdout.write(text);
    return;
  }

  let sweep: { title: string; points: SweepPoint[] } | undefined;
  if (args.sweep) {
    const [siteId, variantArg] = args.sweep.split(':');
    const site = result.sites.find((x) => x.id === siteId);
    if (!site)
      fail(`--sweep: no site "${siteId}" (known: ${result.sites.map((x) => x.id).join(', ')})`, 1);
    const variantId = variantArg ?? site.variant;
    if (!plan.variants.some((v) => v.id === variantId)) {
      fail(
        `--sweep: no variant "${variantId}" (known: ${plan.variants.map((v) => v.id).join(', ')})`,
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
        `could not print ${args.pdf} with Chromium at ${CHROMIUM_PATH}: ${(e as Error).message.split('\n')[0]}`,
        1,
      );
    }
  }
  process.stderr.write(
    `seedfall: brief written${args.out ? ` to ${args.out}` : ''}${args.pdf ? ` and ${args.pdf}` : ''}\n`,
  );
}

main().catch((e: unknown) => fail(e instanceof Error ? e.message : String(e), 1));
