// `plan`: the results as JSON (with the caution) or as a text table.
import { CAUTION_TEXT, formatPlanText } from '../brief';
import type { Plan } from '../plan';
import type { PlanResult } from '../planner';
import { terminalText, type Args, type CliIO } from './args';

/** Writes the planned results in the format asked for. */
export function planCommand(args: Args, io: CliIO, plan: Plan, result: PlanResult): void {
  if (args.format === 'json') {
    io.out(`${JSON.stringify({ ...result, caution: CAUTION_TEXT }, null, 2)}\n`);
  } else {
    io.out(terminalText(formatPlanText(plan, result)));
  }
}
