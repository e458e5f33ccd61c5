// `export`: GeoJSON, KML, GPX or the schedule CSV, to a file or stdout.
import { toGeoJSON, toGPX, toKML, toScheduleCSV } from '../formats';
import type { Plan } from '../plan';
import type { PlanResult } from '../planner';
import { planSafety } from '../safety';
import type { Args, CliIO } from './args';
import { write } from './plan-file';

/** Writes the plan's results in the exchange format asked for. */
export function exportCommand(args: Args, io: CliIO, plan: Plan, result: PlanResult): void {
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
}
