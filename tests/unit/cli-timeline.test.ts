import { mkdtempSync, rmSync, writeFileSync } from 'node:fs';
import { tmpdir } from 'node:os';
import { join } from 'node:path';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { runCli } from '../../app/cli';
import { validatePlan, type Plan } from '../../app/plan';
import { type TimelineEntry, windowsFromTimeline } from '../../app/planner';
import type { SweepReply, SweepRequest } from '../../app/worker';
import demo from '../../data/demo-plan.json';

// The CLI contract (app/cli/main.ts header): exit 0 done, 1 usage or file error, 2 invalid plan.

let dir: string;
beforeAll(() => {
  dir = mkdtempSync(join(tmpdir(), 'seedfall-timeline-'));
});
afterAll(() => {
  rmSync(dir, { recursive: true, force: true });
});

function writePlan(name: string, content: unknown): string {
  const path = join(dir, name);
  writeFileSync(path, JSON.stringify(content));
  return path;
}

async function run(...argv: string[]): Promise<{ code: number; out: string; err: string }> {
  let out = '';
  let err = '';
  const code = await runCli(argv, { out: (t) => void (out += t), err: (t) => void (err += t) });
  return { code, out, err };
}

/**
 * The app's own answer: the sweep worker module (what the Timeline button starts) run here with
 * a stand-in for the worker global, sent the request the button sends for the plan the app holds.
 */
async function appTimeline(plan: Plan): Promise<TimelineEntry[]> {
  const posted: SweepReply[] = [];
  const g = globalThis as unknown as { self?: unknown };
  g.self = { postMessage: (m: SweepReply) => posted.push(m) };
  await import('../../app/worker/sweep-worker');
  const worker = g.self as { onmessage: (ev: { data: SweepRequest }) => void };
  worker.onmessage({ data: { id: 1, kind: 'timeline', plan, step_s: 900 } });
  const reply = posted[0];
  if (!reply || !('timeline' in reply)) throw new Error(`worker answered ${JSON.stringify(reply)}`);
  return reply.timeline;
}

describe('npm run timeline against the app', () => {
  it('gives the demo plan exactly the entries and windows the app computes', async () => {
    // The app holds the validated plan (defaults resolved), as the CLI reads it from the file.
    const v = validatePlan(structuredClone(demo));
    if (!v.ok) throw new Error('the demo plan must validate');
    const app = await appTimeline(v.plan);
    const cli = await run('timeline', 'data/demo-plan.json', '--format', 'json');
    expect(cli.err).toBe('');
    expect(cli.code).toBe(0);
    const json = JSON.parse(cli.out) as {
      timeZone: string;
      step_s: number;
      entries: TimelineEntry[];
      windows: unknown;
    };
    expect(json.timeZone).toBe('UTC+01:00'); // demo plan time 2026-12-01T09:30:00+01:00
    expect(json.step_s).toBe(900);
    // 09:30 to 13:00 local (the plan time and its one forecast) every 15 min: 15 times.
    expect(app.length).toBe(15);
    expect(json.entries).toEqual(JSON.parse(JSON.stringify(app)));
    expect(json.windows).toEqual(windowsFromTimeline(app, v.plan.requiredPHit));
    // Not a trivial answer: some site has a window and some site has none.
    const w = windowsFromTimeline(app, v.plan.requiredPHit);
    expect(w.some((s) => s.windows.length > 0)).toBe(true);
    expect(w.some((s) => s.windows.length === 0)).toBe(true);
  }, 120_000);
});

describe('npm run timeline options and messages', () => {
  it.each(['30s', '7h', '5', '5 m', '-5m', '1.5s', 'abc', '1e3s', ''])(
    '--step %j is refused naming the option, its range and units',
    async (step) => {
      const r = await run('timeline', 'data/demo-plan.json', '--step', step);
      expect(r.code).toBe(1);
      expect(r.out).toBe('');
      expect(r.err).toMatch(/^seedfall: --step must be a duration from 1m to 6h/);
      expect(r.err).toContain('s, m or h');
    },
  );

  it('reads 90s, 1.5m and 1h as seconds and prints a table in the plan zone with UTC', async () => {
    for (const [step, s] of [
      ['90s', 90],
      ['1.5m', 90],
      ['1h', 3600],
    ] as const) {
      const r = await run(
        'timeline',
        'data/demo-plan.json',
        '--step',
        step,
        '--samples',
        '20',
        '--format',
        'json',
      );
      expect(r.code).toBe(0);
      const j = JSON.parse(r.out) as { step_s: number; samples: number; entries: unknown[] };
      expect(j.step_s).toBe(s);
      expect(j.samples).toBe(20);
      // 3.5 h span: floor(12600 / s) + 1 times.
      expect(j.entries.length).toBe(Math.floor(12600 / s) + 1);
    }
    const t = await run('timeline', 'data/demo-plan.json', '--step', '1h', '--samples', '20');
    expect(t.code).toBe(0);
    expect(t.out).toContain('Times in UTC+01:00');
    // 08:30Z is 09:30 at +01:00: the first row of the P(hit) table.
    expect(t.out).toMatch(/^09:30 {6}08:30 /m);
    expect(t.out).toMatch(/^s\d\d +(\d\d:\d\d UTC\+01:00 \(\d\d:\d\d UTC\)|no evaluated time)/m);
    expect(t.out).toContain('CAUTION:');
  }, 120_000);

  it('a plan without forecasts exits 1 and says what is missing', async () => {
    const plan = structuredClone(demo) as { winds: { forecasts?: unknown } };
    delete plan.winds.forecasts;
    const r = await run('timeline', writePlan('no-forecasts.json', plan));
    expect(r.code).toBe(1);
    expect(r.err).toMatch(/no wind forecasts \(winds\.forecasts\)/);
  });

  it('a plan in -05:30 reports that zone; one forecast at the plan time itself is not a span', async () => {
    const plan = structuredClone(demo) as {
      time: string;
      winds: { forecasts: { time: string }[] };
    };
    plan.time = '2026-12-01T03:00:00-05:30';
    plan.winds.forecasts[0].time = '2026-12-01T12:00:00Z';
    const r = await run(
      'timeline',
      writePlan('m530.json', plan),
      '--step',
      '3h',
      '--samples',
      '10',
      '--format',
      'json',
    );
    expect(r.code).toBe(0);
    expect(JSON.parse(r.out).timeZone).toBe('UTC-05:30');
    plan.winds.forecasts[0].time = '2026-12-01T08:30:00Z'; // = 03:00-05:30
    const same = await run('timeline', writePlan('same.json', plan));
    expect(same.code).toBe(1);
    expect(same.err).toMatch(/no time other than the plan time/);
    expect(same.err).toContain('winds.forecasts[0].time');
  }, 60_000);

  it('a step giving more than 500 times names a step that fits', async () => {
    const plan = structuredClone(demo) as { winds: { forecasts: { time: string }[] } };
    plan.winds.forecasts[0].time = '2026-12-03T09:30:00+01:00'; // 48 h after the plan time
    const r = await run('timeline', writePlan('long.json', plan), '--step', '5m');
    expect(r.code).toBe(1);
    // 48 h / 5 min + 1 = 577 times; 48 h / 499 = 5.77 min → 6 min.
    expect(r.err).toContain('--step 5m gives 577 times');
    expect(r.err).toContain('use --step 6m or more');
  });

  it('the timeline option list is its own', async () => {
    const r = await run('timeline', 'data/demo-plan.json', '--out', 'x.html');
    expect(r.code).toBe(1);
    expect(r.err).toContain('unknown option --out for timeline');
  });
});
