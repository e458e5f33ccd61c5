/**
 * Speed of the planning core (npm run bench). Prints descents per second for passive,
 * fixed-heading and homing Monte Carlo flights through a 40-layer wind profile, in still air and
 * with moderate turbulence side by side, the speed-up over the naive 10 ms integrator at equal
 * accuracy, and the time of the full demo plan without and with its modelled turbulence.
 * Targets (issue #11): with turbulence ≥ 5·10^6 passive and ≥ 10^6 homing descents/s and the demo
 * plan ≤ 60 ms, set on a machine where still air gave 10^7 passive, 1.2·10^6 homing and a 43 ms
 * demo plan. Absolute speed follows the machine (a shared 2-core runner is up to half as fast),
 * so the pass mark is the same targets as ratios to still air measured side by side in this run:
 * passive ≥ 0.5, homing ≥ 0.83, demo plan ≤ 1.4 × its still-air time; the absolute figures are
 * printed beside them. ≥ 100× the naive integrator at ≤ 0.1 m.
 * Then a plan at the format's limit of 1,000 sites (tests/support/make-field.ts): planning, the
 * safety analysis, each export and the brief, as the CLI runs them (plan + safety + output), each
 * under 10 s (issue #9), and as ratios to the planning time.
 * Over terrain (issue #13): the demo plan re-planned over a synthesised 2000 × 2000-cell
 * elevation model within 2× of the same plan on flat ground, side by side.
 */
import { readFileSync } from 'node:fs';
import { briefHtml } from '../app/brief/brief-html';
import { briefSafety } from '../app/brief/brief-safety';
import { FallTable } from '../app/model/fall-table';
import {
  fixedHeadingProgramme,
  flySamples,
  passiveOffset,
  type FlightSetup,
} from '../app/model/flight';
import { naiveFlight } from '../app/model/naive-integrator';
import { planDrop } from '../app/planner/planner';
import { terrainArea } from '../app/planner/terrain-area';
import { Dem } from '../app/formats/dem';
import { planSafety } from '../app/safety/plan-safety';
import { Rng } from '../app/model/rng';
import { toGeoJSON, toGPX, toKML, toScheduleCSV, toSitesCSV } from '../app/formats';
import { validatePlan } from '../app/plan/validate';
import { fallTurbulence } from '../app/model/turbulence';
import { WindProfile } from '../app/model/wind';
import { type Uncertainty } from '../app/model/types';
import { makeField } from '../tests/support/make-field';

const layers = Array.from({ length: 40 }, (_, i) => ({
  altitude_m: 10 + i * 15,
  fromDeg: (250 + i * 2.5) % 360,
  speed_mps: 3 + 6 * Math.sin((i / 40) * Math.PI),
}));
const wind = new WindProfile(layers, { groundElevation_m: 100 });
const top_m = 100 + 400;
const unc: Uncertainty = {
  windSpeed_mps: 1,
  windCorrelation_m: 300,
  descentRate_pct: 5,
  releasePosition_m: 3,
  heading_deg: 5,
  releaseTiming_s: 0.3,
};
const carrier = { x: -12, y: -4 };

function setup(guidance: FlightSetup['guidance'], gusty = false): FlightSetup {
  const table = new FallTable({
    top_m,
    bottom_m: 100,
    descentRateSL_mps: 3,
    entryLoss_m: 6,
    isaOffset_K: 0,
    wind,
  });
  const w = wind.at(top_m);
  return {
    table,
    // Moderate turbulence: W20 = 30 kt (MIL-F-8785C class), modelled gust and vertical air;
    // still air: W20 = 0, as the planner sets up `turbulence: "none"`.
    turbulence: fallTurbulence(table, 100, { w20_mps: gusty ? 30 * 0.514444 : 0 }),
    guidance,
    cotGamma: guidance === 'passive' ? 0 : 1 / Math.tan((45 * Math.PI) / 180),
    controlTime_s: guidance === 'passive' ? 0 : 60,
    carrier,
    windTop: { x: w.east_mps, y: w.north_mps },
  };
}

function rate(guidance: FlightSetup['guidance'], n: number, gusty: boolean): number {
  const su = setup(guidance, gusty);
  const off = passiveOffset(su);
  const site = { x: off.x + 40, y: off.y - 30 };
  const programme =
    guidance === 'fixed-heading' ? fixedHeadingProgramme(su, { x: 40, y: -30 }) : undefined;
  const xs = new Float64Array(n);
  const ys = new Float64Array(n);
  const req = {
    n,
    rng: new Rng(1),
    uncertainty: unc,
    release: { x: 0, y: 0 },
    trackUnit: { x: -0.95, y: -0.31 },
    groundSpeed_mps: 12.6,
    site,
    programme,
  };
  flySamples(su, { ...req, n: Math.min(n, 20000) }, xs, ys); // warm-up
  const t0 = performance.now();
  flySamples(su, req, xs, ys);
  return n / ((performance.now() - t0) / 1000);
}

/**
 * Naive baseline: a 10 ms midpoint integrator per descent. Ours: the fall table built once and
 * amortised over a 2,000-sample Monte Carlo, plus the per-sample cost. Equal accuracy: the two
 * nominal landings must agree within 0.1 m.
 */
function naiveComparison(samplesPerSec: number): { ratio: number; diff_m: number } {
  const reps = 200;
  let t0 = performance.now();
  let ours = { x: 0, y: 0 };
  for (let i = 0; i < reps; i++) ours = passiveOffset(setup('passive'));
  const tTable_ms = (performance.now() - t0) / reps;
  const tOurs_ms = tTable_ms / 2000 + 1000 / samplesPerSec;
  const carrier0 = setup('passive').carrier;
  let ref = { x: 0, y: 0 };
  t0 = performance.now();
  for (let i = 0; i < 20; i++) {
    ref = naiveFlight({
      top_m,
      bottom_m: 100,
      descentRateSL_mps: 3,
      entryLoss_m: 6,
      isaOffset_K: 0,
      wind,
      carrier: carrier0,
    });
  }
  const tNaive_ms = (performance.now() - t0) / 20;
  return { ratio: tNaive_ms / tOurs_ms, diff_m: Math.hypot(ours.x - ref.x, ours.y - ref.y) };
}

// Still air and turbulence alternate, so both see the same machine state; the best of five
// runs of each, because a shared machine only ever slows a run down.
const pair = (g: FlightSetup['guidance'], n: number): [number, number] => {
  let still = 0;
  let turb = 0;
  for (let r = 0; r < 5; r++) {
    still = Math.max(still, rate(g, n, false));
    turb = Math.max(turb, rate(g, n, true));
  }
  return [still, turb];
};
const [passive, passiveT] = pair('passive', 500_000);
const [fixed, fixedT] = pair('fixed-heading', 500_000);
const [homing, homingT] = pair('homing', 100_000);
const naive = naiveComparison(passive);

const demo = JSON.parse(readFileSync(new URL('../data/demo-plan.json', import.meta.url), 'utf8'));
const checked = validatePlan(demo);
if (!checked.ok) throw new Error('demo plan invalid');
const still = {
  ...checked.plan,
  uncertainty: { ...checked.plan.uncertainty, turbulence: 'none' as const },
};
for (let i = 0; i < 3; i++) {
  planDrop(checked.plan);
  planDrop(still);
}
const runs = 15;
const times: number[] = [];
const timesStill: number[] = [];
for (let i = 0; i < runs; i++) {
  let t0 = performance.now();
  planDrop(still);
  timesStill.push(performance.now() - t0);
  t0 = performance.now();
  planDrop(checked.plan);
  times.push(performance.now() - t0);
}
times.sort((a, b) => a - b);
timesStill.sort((a, b) => a - b);
const sites = checked.plan.sites.length;
const variants = checked.plan.variants.length;

const line = (label: string, value: string, ok: boolean): void =>
  console.log(`${ok ? 'ok  ' : 'MISS'}  ${label.padEnd(60)} ${value}`);
const fmt = (x: number): string => x.toExponential(2);
const side = (still: number, turb: number): string =>
  `${fmt(turb)}  still air ${fmt(still)}  ratio ${(turb / still).toFixed(2)}`;
console.log('Monte Carlo descents/s (40 layers), moderate turbulence vs still air');
line(
  '  passive (ratio ≥ 0.5; 5e6/s on the reference machine)',
  side(passive, passiveT),
  passiveT / passive >= 0.5,
);
line('  fixed-heading (ratio ≥ 0.5)', side(fixed, fixedT), fixedT / fixed >= 0.5);
line(
  '  homing (ratio ≥ 0.83; 1e6/s on the reference machine)',
  side(homing, homingT),
  homingT / homing >= 0.83,
);
line('speed-up over naive 10 ms integrator', `${naive.ratio.toFixed(0)}x`, naive.ratio >= 100);
line('  difference from naive integrator', `${naive.diff_m.toFixed(4)} m`, naive.diff_m <= 0.1);
const tDemo = times[0];
const tStill = timesStill[0];
line(
  `demo plan (${sites} sites x ${variants} variants x ${checked.plan.monteCarlo.samples}), best of ${runs} (ratio ≤ 1.4; 60 ms on the reference machine)`,
  `${tDemo.toFixed(1)} ms  still air ${tStill.toFixed(1)} ms  ratio ${(tDemo / tStill).toFixed(2)}`,
  tDemo / tStill <= 1.4,
);

// ---- The demo plan over a 2000 × 2000-cell elevation model (issue #13) ----
// Smooth hills (±12 m about the plan ground, wavelengths 300–900 m) on a WGS 84 grid covering
// terrainArea(plan); re-planning over it against the same plan on flat ground, side by side,
// best of the runs. Target: ≤ 2× the flat time.
{
  const plan = checked.plan;
  const area = terrainArea(plan);
  const cols = 2000;
  const rows = 2000;
  const dx = (area.east - area.west) / (cols - 2);
  const dy = (area.north - area.south) / (rows - 2);
  const x0 = area.west - dx;
  const y0 = area.north + dy;
  const mLat = 111_320;
  const mLon = 111_320 * Math.cos(plan.release.lat * (Math.PI / 180));
  const values = new Float32Array(cols * rows);
  for (let r = 0; r < rows; r++) {
    const y = (y0 - (r + 0.5) * dy - plan.release.lat) * mLat;
    for (let c = 0; c < cols; c++) {
      const x = (x0 + (c + 0.5) * dx - plan.release.lon) * mLon;
      values[r * cols + c] =
        plan.groundElevation_m +
        6 * Math.sin(x / 140) * Math.cos(y / 190) +
        4 * Math.sin((x + y) / 310) +
        2 * Math.cos((x - 2 * y) / 95);
    }
  }
  const dem = new Dem({
    file: 'bench-hills',
    epsg: 4326,
    cols,
    rows,
    x0,
    y0,
    dx,
    dy,
    values,
    nodata: null,
  });
  for (let i = 0; i < 2; i++) {
    planDrop(plan);
    planDrop(plan, { terrain: dem });
  }
  let tFlat = Infinity;
  let tHills = Infinity;
  const hillRuns = 15;
  for (let i = 0; i < hillRuns; i++) {
    let t0 = performance.now();
    planDrop(plan);
    tFlat = Math.min(tFlat, performance.now() - t0);
    t0 = performance.now();
    planDrop(plan, { terrain: dem });
    tHills = Math.min(tHills, performance.now() - t0);
  }
  line(
    `demo plan (${sites} sites) over a ${cols} x ${rows} DEM, re-plan, best of ${hillRuns} (ratio ≤ 2)`,
    `${tHills.toFixed(1)} ms  flat ground ${tFlat.toFixed(1)} ms  ratio ${(tHills / tFlat).toFixed(2)}`,
    tHills / tFlat <= 2,
  );
}

// ---- A plan at the format's limit: 1,000 sites over the demo area ----
{
  const field = validatePlan(makeField(1000, 1));
  if (!field.ok) throw new Error('generated 1,000-site plan invalid');
  const plan = field.plan;
  const ms = <T>(f: () => T): [T, number] => {
    const t0 = performance.now();
    const r = f();
    return [r, performance.now() - t0];
  };
  const [result, tPlan] = ms(() => planDrop(plan));
  const [safety, tSafety] = ms(() => planSafety(plan, result));
  const hazard = { hazardArea: safety.hazardArea };
  const outputs: [string, () => unknown][] = [
    ['GeoJSON', () => JSON.stringify(toGeoJSON(plan, result, hazard), null, 1)],
    ['KML', () => toKML(plan, result, hazard)],
    ['GPX', () => toGPX(plan, result)],
    ['schedule CSV', () => toScheduleCSV(plan, result)],
    ['sites CSV', () => toSitesCSV(plan)],
    ['brief', () => briefHtml(plan, result, { safety: briefSafety(safety, result) })],
  ];
  const ratio = (t: number): string => `${(t / tPlan).toFixed(2)}x plan`;
  const sec = (t: number): string => `${(t / 1000).toFixed(2)} s`;
  console.log(`\n1,000-site plan (${plan.sites.length} sites, ${plan.monteCarlo.samples} samples)`);
  line('  plan (planDrop)', sec(tPlan), true);
  line('  safety analysis (planSafety)', `${sec(tSafety)}  ${ratio(tSafety)}`, true);
  // The CLI's export and brief each plan and run the safety analysis, then write (app/cli/).
  for (const [label, f] of outputs) {
    const [, t] = ms(f);
    const total = tPlan + tSafety + t;
    line(
      `  ${label}: plan + safety + output (< 10 s)`,
      `${sec(total)}  output ${sec(t)} = ${ratio(t)}`,
      total < 10_000,
    );
  }
}
