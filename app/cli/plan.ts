// `plan`: the results as JSON (with the caution) or as a text table.
import { CAUTION_TEXT, formatPlanText } from '../brief';
import type { Plan } from '../plan';
import type { PlanResult } from '../planner';
import { oneLine, terminalText, type Args, type CliIO } from './args';

/**
 * Writes the planned results in the format asked for. The warnings are in both: the text report
 * prints them under the table; JSON carries them in `warnings` and, so that a person running it
 * sees them while stdout stays one JSON document, also writes each to stderr.
 */
export function planCommand(args: Args, io: CliIO, plan: Plan, result: PlanResult): void {
  if (args.format === 'json') {
    io.out(`${JSON.stringify({ ...result, caution: CAUTION_TEXT }, null, 2)}\n`);
    for (const w of result.warnings) io.err(`seedfall: warning: ${oneLine(w)}\n`);
  } else {
    io.out(terminalText(formatPlanText(plan, result)));
  }
}
