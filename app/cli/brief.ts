// `brief`: the drop brief as HTML and/or PDF, with an optional P(hit)-against-altitude sweep.
import { briefHtml, briefSafety } from '../brief';
import type { ElevationModel } from '../model';
import type { Plan } from '../plan';
import {
  altitudeSweep,
  BRIEF_TIMELINE_MAX_FLIGHTS,
  planTimeline,
  sweepHeightsAGL,
  TIMELINE_STEP_S,
  timelineFlights,
  type PlanResult,
  type SweepPoint,
} from '../planner';
import { planSafety } from '../safety';
import { fail, oneLine, type Args, type CliIO } from './args';
import { write } from './plan-file';

/** Writes the brief where asked and reports where it went on stderr. */
export async function briefCommand(
  args: Args,
  io: CliIO,
  plan: Plan,
  result: PlanResult,
  terrainNote?: string,
  terrain?: ElevationModel,
): Promise<void> {
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
      points: altitudeSweep(plan, siteId, variantId, heights, { terrain }),
    };
  }
  // The same timeline as the app's Timeline button (planTimeline, every 15 min) when there are
  // forecasts, unless it would fly more descents than a brief should wait for.
  const forecasts = (plan.winds.forecasts ?? []).length > 0;
  const flights = forecasts ? timelineFlights(plan, TIMELINE_STEP_S) : 0;
  const timeline =
    forecasts && flights <= BRIEF_TIMELINE_MAX_FLIGHTS
      ? planTimeline(plan, { step_s: TIMELINE_STEP_S, terrain })
      : undefined;
  const timelineOmitted =
    forecasts && timeline === undefined
      ? `Left out: this plan's timeline would fly ${(flights / 1e6).toFixed(1)} million descents ` +
        `(more than ${BRIEF_TIMELINE_MAX_FLIGHTS / 1e6} million for a brief). ` +
        `Run npm run timeline on the plan for it.`
      : undefined;
  if (timelineOmitted) io.err(`seedfall: note: timeline ${timelineOmitted}\n`);
  const html = briefHtml(plan, result, {
    sweep,
    timeline,
    timelineOmitted,
    paper: args.paper,
    safety: briefSafety(planSafety(plan, result), result),
    terrainNote,
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
