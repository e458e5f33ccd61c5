/**
 * Headless Seedfall: plan file in, results out.
 *   npm run --silent plan  -- <plan.json> [--format json|text] [--samples N] [--seed N] [--terrain F]
 *   npm run --silent brief -- <plan.json> --out <brief.html> [--pdf <brief.pdf>] [--paper A4|Letter] [--terrain F]
 *   npm run --silent export -- <plan.json> --format geojson|kml|gpx|csv [--out <file>] [--bom] [--terrain F]
 *   npm run --silent timeline -- <plan.json> [--step 5m] [--format json|text] [--samples N] [--terrain F]
 * Exit codes: 0 done, 1 usage or file error, 2 invalid plan, 3 internal error (one line, no trace).
 *
 * Everything is written through the `CliIO` given to `runCli` and the exit code is returned, never
 * `process.exit()`-ed: output to a pipe is flushed completely before the process ends.
 */
import { writeSync } from 'node:fs';
import { resolve } from 'node:path';
import { fileURLToPath } from 'node:url';
import { DemError } from '../formats';
import { planDrop, type PlanResult } from '../planner';
import { workIssue } from '../plan';
import { CliExit, fail, oneLine, parseArgs, type CliIO } from './args';
import { briefCommand } from './brief';
import { exportCommand } from './export';
import { planCommand } from './plan';
import { readPlan, sameFile } from './plan-file';
import { loadTerrain } from './terrain';
import { timelineCommand } from './timeline';

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
  if (args.seed !== undefined) plan.monteCarlo.seed = args.seed;
  if (args.samples !== undefined) {
    // validatePlan checked the work bound for the file's own sample count.
    plan.monteCarlo.samples = args.samples;
    const work = workIssue(plan);
    if (work) fail(`--samples: ${oneLine(work.message)}`, 2);
  }
  // Read before planning: a bad elevation model ends the command before anything is written.
  const terrain = await loadTerrain(args, plan);
  // The timeline runs its own planDrop per time; the plan time's result alone is not needed.
  if (args.command === 'timeline') {
    try {
      return timelineCommand(args, io, plan, warnings, terrain?.dem);
    } catch (e) {
      if (e instanceof DemError) fail(oneLine(e.message), 1);
      throw e;
    }
  }
  let result: PlanResult;
  try {
    result = planDrop(plan, terrain ? { terrain: terrain.dem } : {});
  } catch (e) {
    if (e instanceof DemError) fail(oneLine(e.message), 1);
    throw e;
  }
  result.warnings.unshift(...warnings);

  if (args.command === 'plan') planCommand(args, io, plan, result);
  else if (args.command === 'export') exportCommand(args, io, plan, result);
  else {
    try {
      await briefCommand(args, io, plan, result, terrain?.note, terrain?.dem);
    } catch (e) {
      if (e instanceof DemError) fail(oneLine(e.message), 1);
      throw e;
    }
  }
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
