// The demo plan's outputs, generated the way the CLI and the app generate them, for the golden
// comparison (tests/unit/golden.test.ts; `npx tsx scripts/golden.ts` rewrites the files).
import { fileURLToPath } from 'node:url';
import { runCli } from '../../app/cli';
import { briefHtml } from '../../app/brief/brief-html';
import { toSitesCSV } from '../../app/formats';
import { briefSafety } from '../../app/brief/brief-safety';
import { planSafety } from '../../app/safety/plan-safety';
import { planDrop } from '../../app/planner/planner';
import { validatePlan } from '../../app/plan/validate';
import { altitudeSweep, sweepHeightsAGL } from '../../app/planner/sweeps';

/** Where the golden files live. */
export const GOLDEN_DIR = fileURLToPath(new URL('../fixtures/golden/', import.meta.url));
/** The plan they are made from. */
export const DEMO_PLAN = fileURLToPath(new URL('../../data/demo-plan.json', import.meta.url));
/** The brief's "generated" stamp, fixed so the brief is the same on every run. */
export const GOLDEN_GENERATED_AT = new Date('2026-12-01T07:00:00Z');

async function cli(...argv: string[]): Promise<string> {
  let out = '';
  let err = '';
  const code = await runCli(argv, { out: (t) => (out += t), err: (t) => (err += t) });
  if (code !== 0) throw new Error(`seedfall ${argv.join(' ')} exited ${code}: ${err}`);
  return out;
}

/** File name → content of every golden output of the demo plan. */
export async function goldenOutputs(): Promise<Record<string, string>> {
  const { readFileSync } = await import('node:fs');
  const checked = validatePlan(JSON.parse(readFileSync(DEMO_PLAN, 'utf8')));
  if (!checked.ok) throw new Error(checked.errors.map((e) => e.message).join('; '));
  const plan = checked.plan;
  const result = planDrop(plan);
  result.warnings.unshift(...checked.warnings);
  // The brief as `npm run brief -- data/demo-plan.json --sweep <first site>` makes it, with a
  // fixed "generated" time instead of the clock.
  const site = result.sites[0];
  const sweep = {
    title: `${site.id} · ${site.variant}`,
    points: altitudeSweep(
      plan,
      site.id,
      site.variant,
      sweepHeightsAGL(plan, result.releaseAltitudeMSL_m),
    ),
  };
  const brief = briefHtml(plan, result, {
    sweep,
    paper: 'A4',
    safety: briefSafety(planSafety(plan, result), result),
    generatedAt: GOLDEN_GENERATED_AT,
  });
  return {
    'plan.json': await cli('plan', DEMO_PLAN, '--format', 'json'),
    'plan.txt': await cli('plan', DEMO_PLAN, '--format', 'text'),
    'brief.html': brief,
    'export.geojson': await cli('export', DEMO_PLAN, '--format', 'geojson'),
    'export.kml': await cli('export', DEMO_PLAN, '--format', 'kml'),
    'export.gpx': await cli('export', DEMO_PLAN, '--format', 'gpx'),
    'schedule.csv': await cli('export', DEMO_PLAN, '--format', 'csv'),
    'sites.csv': toSitesCSV(plan),
  };
}
