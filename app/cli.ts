/**
 * Headless planner: plan file in, results out.
 *   npm run --silent plan -- <plan.json> [--format json|text] [--samples N] [--seed N]
 * Exit codes: 0 planned, 1 usage or file error, 2 invalid plan.
 */
import { readFileSync } from 'node:fs';
import {
  CAUTION_TEXT,
  formatPlanText,
  planDrop,
  validatePlan,
  type PlanResult,
} from './core/index';

interface Args {
  file?: string;
  format: 'json' | 'text';
  samples?: number;
  seed?: number;
}

function fail(message: string, code: number): never {
  process.stderr.write(`seedfall: ${message}\n`);
  process.exit(code);
}

function parseArgs(argv: string[]): Args {
  const args: Args = { format: 'text' };
  for (let i = 0; i < argv.length; i++) {
    const a = argv[i];
    const value = (): string => {
      const v = argv[++i];
      if (v === undefined) fail(`${a} needs a value`, 1);
      return v;
    };
    if (a === '--format') {
      const f = value();
      if (f !== 'json' && f !== 'text') fail(`--format must be json or text (got "${f}")`, 1);
      args.format = f;
    } else if (a === '--samples' || a === '--seed') {
      const n = Number(value());
      if (!Number.isInteger(n) || (a === '--samples' && (n < 1 || n > 100000))) {
        fail(`${a} must be an integer${a === '--samples' ? ' between 1 and 100000' : ''}`, 1);
      }
      if (a === '--samples') args.samples = n;
      else args.seed = n;
    } else if (a === '--help' || a === '-h') {
      process.stdout.write(
        'usage: npm run --silent plan -- <plan.json> [--format json|text] [--samples N] [--seed N]\n',
      );
      process.exit(0);
    } else if (a.startsWith('--')) {
      fail(`unknown option ${a} (known: --format, --samples, --seed)`, 1);
    } else if (args.file === undefined) {
      args.file = a;
    } else {
      fail(`only one plan file, got "${args.file}" and "${a}"`, 1);
    }
  }
  return args;
}

// A closed pipe (e.g. `| head`) ends the output quietly instead of with a stack trace.
process.stdout.on('error', (e: NodeJS.ErrnoException) => {
  if (e.code === 'EPIPE') process.exit(0);
  throw e;
});

function main(): void {
  const args = parseArgs(process.argv.slice(2));
  if (!args.file) fail('no plan file given (usage: plan <plan.json> [--format json|text])', 1);
  let text: string;
  try {
    text = readFileSync(args.file, 'utf8');
  } catch (e) {
    fail(`cannot read ${args.file}: ${(e as NodeJS.ErrnoException).code ?? String(e)}`, 1);
  }
  let raw: unknown;
  try {
    raw = JSON.parse(text);
  } catch (e) {
    fail(`${args.file} is not valid JSON: ${(e as Error).message}`, 2);
  }
  const checked = validatePlan(raw);
  if (!checked.ok) {
    const lines = checked.errors.map((e) => `  - ${e.message}`).join('\n');
    fail(`${args.file} is not a valid plan (${checked.errors.length} problem(s)):\n${lines}`, 2);
  }
  const plan = checked.plan;
  if (args.samples !== undefined) plan.monteCarlo.samples = args.samples;
  if (args.seed !== undefined) plan.monteCarlo.seed = args.seed;
  const result: PlanResult = planDrop(plan);
  result.warnings.unshift(...checked.warnings);
  if (args.format === 'json') {
    process.stdout.write(`${JSON.stringify({ ...result, caution: CAUTION_TEXT }, null, 2)}\n`);
  } else {
    process.stdout.write(formatPlanText(plan, result));
  }
}

main();
