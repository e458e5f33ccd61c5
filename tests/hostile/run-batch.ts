/**
 * Runs hostile cases in one process: CLI cases through the CLI's own `runCli` (the same code as
 * `npm run plan`), importer cases through the core importers. Started by run-corpus.ts as
 *   node --max-old-space-size=1024 --import tsx tests/hostile/run-batch.ts <jobs.json> <i,j,…>
 * and reports one JSON line per step on stdout ({"start"…} before, {"ran"…} after), so the parent
 * can tell which case hung or crashed the process.
 */
import { existsSync, readFileSync, rmSync, statSync, writeSync } from 'node:fs';
import { join, resolve } from 'node:path';
import { fileURLToPath } from 'node:url';
import { runCli } from '../../app/cli';
import { importSites } from '../../app/formats/import-sites';
import { importSounding } from '../../app/formats/sounding-csv';
import { FRAME_LIMIT_M } from '../../app/plan/plan-limits';
import { blendSurfaceReading } from '../../app/formats/surface-reading';
import { type TerrainClass } from '../../app/model/surface-wind';
import { validatePlan } from '../../app/plan/validate';
import { decodeWindsAloft, stationLayers } from '../../app/formats/winds-aloft';
import type { WindLayer } from '../../app/model/types';
import demoJson from '../../data/demo-plan.json';
import {
  judgeCli,
  judgeImport,
  mustRejectOf,
  type CaseMeta,
  type CliOutcome,
  type CliRun,
  type ImportOutcome,
} from './judge';

type Json = Record<string, unknown>;

export interface Job {
  meta: CaseMeta;
  /** Absolute path of the case's input. */
  path: string;
  /** Folder for --out files. */
  outDir: string;
}

/** The command line for one run of a CLI case. */
export function cliArgs(run: CliRun, path: string, out: string): string[] {
  switch (run) {
    case 'plan-json':
      return ['plan', path, '--format', 'json'];
    case 'plan-text':
      return ['plan', path, '--format', 'text'];
    case 'brief':
      return ['brief', path, '--out', out];
    default:
      return ['export', path, '--format', run, '--out', out];
  }
}

/** The case's text when it is a readable regular file, else null (devices, folders, FIFOs). */
export function caseText(path: string): string | null {
  try {
    return statSync(path).isFile() ? readFileSync(path, 'utf8') : null;
  } catch {
    return null;
  }
}

const send = (msg: unknown) => writeSync(1, `${JSON.stringify(msg)}\n`);

async function cliCase(i: number, job: Job): Promise<void> {
  const must = mustRejectOf(job.meta, caseText(job.path));
  for (const run of job.meta.runs ?? ['plan-json']) {
    send({ start: i, run });
    const out = join(job.outDir, `${job.meta.id}.${run}.out`);
    rmSync(out, { force: true });
    const o: CliOutcome = { run, code: null, stdout: '', stderr: '' };
    o.code = await runCli(cliArgs(run, job.path, out), {
      out: (t) => void (o.stdout += t),
      err: (t) => void (o.stderr += t),
    });
    if (existsSync(out)) {
      o.output = readFileSync(out, 'utf8');
      rmSync(out, { force: true });
    }
    send({ ran: i, run, failures: judgeCli(job.meta, o, must) });
  }
}

const demo = demoJson as unknown as Json;
const demoPlan = (): Json => JSON.parse(JSON.stringify(demo)) as Json;
const planErrors = (p: Json): string[] => {
  const v = validatePlan(p);
  return v.ok ? [] : v.errors.slice(0, 3).map((e) => e.message.slice(0, 200));
};
const lineOf = (m: string) => /^line (\d+)/.exec(m)?.[1];

/** Puts wind layers (and temperatures) into a plan as the Winds panel does. */
function withWinds(
  ref: 'AGL' | 'MSL',
  layers: WindLayer[],
  temps: { altitude_m: number; temperature_K: number }[],
): Json {
  const p = demoPlan();
  p.winds = { ...(p.winds as Json), reference: ref, layers };
  if (temps.length)
    p.atmosphere = { ...(p.atmosphere as Json), sounding: { reference: ref, levels: temps } };
  return p;
}

function importCase(job: Job): ImportOutcome {
  const text = readFileSync(job.path, 'utf8');
  const o: ImportOutcome = { kept: 0, problems: [], planErrors: [] };
  try {
    if (job.meta.target === 'sites') {
      const sites = demo.sites as Json[];
      // As the app calls it (sf-sites-panel.ts): with the plan's release point.
      const release = demo.release as { lat: number; lon: number };
      const r = importSites(text, 'auto', {
        existingIds: sites.map((s) => String(s.id)),
        variantIds: (demo.variants as Json[]).map((v) => String(v.id)),
        near: { lat: release.lat, lon: release.lon, maxDistance_m: FRAME_LIMIT_M },
      });
      o.kept = r.sites.length;
      o.problems = r.problems.map((p) => ({
        where:
          p.line !== undefined
            ? `line ${p.line}`
            : p.feature !== undefined
              ? `feature ${p.feature}`
              : undefined,
        message: p.message,
      }));
      const p = demoPlan();
      p.sites = [...sites, ...r.sites];
      o.planErrors = planErrors(p);
    } else if (job.meta.target === 'winds-aloft') {
      const d = decodeWindsAloft(text);
      o.kept = d.stations.reduce((n, s) => n + s.layers.length, 0);
      const lines = text.split(/\r\n|\r|\n/);
      o.problems = d.problems.map((m) => {
        // A repeated station drops its whole line; extra groups are counted in the message.
        const line = lineOf(m);
        const extra = /(\d+) groups for (\d+) levels/.exec(m);
        const covers = / appears again /.test(m)
          ? (lines[Number(line) - 1] ?? '').trim().split(/\s+/).length - 1
          : extra
            ? Number(extra[1]) - Number(extra[2])
            : undefined;
        return { where: line && m, message: m, covers };
      });
      for (const s of d.stations) {
        const r = stationLayers(d, s.id, {
          groundElevation_m: Number(demo.groundElevation_m),
          reference: 'MSL',
        });
        // Levels left out below the ground are reported here with their count.
        o.problems.push(...r.problems.map((m) => ({ message: m })));
        if (r.layers.length)
          o.planErrors.push(...planErrors(withWinds('MSL', r.layers, r.temperatures)));
      }
    } else if (job.meta.target === 'sounding') {
      const r = importSounding(text);
      o.kept = r.layers.length;
      o.problems = r.problems.map((p) => ({ where: `line ${p.line}`, message: p.message }));
      const ref = r.reference ?? 'AGL';
      if (r.layers.length) o.planErrors = planErrors(withWinds(ref, r.layers, r.temperatures));
    } else {
      const c = JSON.parse(text) as {
        height_m: number;
        speed_mps: number;
        fromDeg: number;
        law: 'log' | 'power';
        terrain: TerrainClass;
        lowestLayer_m?: number;
      };
      const p = demoPlan();
      const winds = p.winds as { layers: WindLayer[] };
      if (c.lowestLayer_m !== undefined)
        winds.layers = [{ altitude_m: c.lowestLayer_m, fromDeg: 270, speed_mps: 10 }];
      const lowest = Math.min(...winds.layers.map((l) => l.altitude_m));
      const before = winds.layers.length;
      // As the app blends it (app/ui/surface-reading-form.ts): within the plan's limits.
      const blend = blendSurfaceReading(
        winds.layers,
        { height_m: c.height_m, speed_mps: c.speed_mps, fromDeg: c.fromDeg },
        { law: c.law, terrain: c.terrain, upTo_m: Math.max(lowest, c.height_m + 1) },
      );
      winds.layers = blend.layers;
      o.kept = blend.added ? blend.layers.length - before : 0;
      o.problems = blend.problems.map((m) => ({ message: m }));
      o.planErrors = planErrors(p);
    }
  } catch (e) {
    o.threw = e instanceof Error ? `${e.name}: ${e.message}`.slice(0, 200) : String(e);
  }
  return o;
}

async function main(): Promise<void> {
  const jobs = JSON.parse(readFileSync(process.argv[2], 'utf8')) as Job[];
  const list = (process.argv[3] ?? '').split(',').filter(Boolean).map(Number);
  for (const i of list) {
    const job = jobs[i];
    if (job.meta.target === 'cli') await cliCase(i, job);
    else {
      send({ start: i, run: 'import' });
      send({ ran: i, run: 'import', failures: judgeImport(job.meta, importCase(job)) });
    }
  }
}

if (process.argv[1] && resolve(process.argv[1]) === fileURLToPath(import.meta.url)) void main();
