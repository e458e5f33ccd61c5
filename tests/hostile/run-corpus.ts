/**
 * Runs the whole bad-input corpus and returns one verdict per case. Batched cases run in
 * run-batch.ts children (two at a time, 1 GiB heap each); a child past the hang limit on one step is
 * killed (a hang) and one that dies is a crash; either way a new child goes on with the next case.
 * Cases marked `separate` run as real CLI processes with their output piped.
 *
 *   npx tsx tests/hostile/run-corpus.ts      prints every failing case and a summary
 */
import { spawn, execFileSync } from 'node:child_process';
import { mkdirSync, mkdtempSync, readFileSync, rmSync, writeFileSync } from 'node:fs';
import { tmpdir } from 'node:os';
import { dirname, isAbsolute, join, resolve } from 'node:path';
import { fileURLToPath } from 'node:url';
import { judgeCli, mustRejectOf, type CaseMeta, type CliOutcome, type CliRun } from './judge';
import { CASES_DIR, largeCases, type HostileCase } from './make-corpus';
import { caseText, cliArgs, type Job } from './run-batch';

export const ROOT = resolve(dirname(fileURLToPath(import.meta.url)), '../..');
/** Longest a single step may take before it counts as a hang, ms. */
export const HANG_MS = 20_000;
/** Wall-clock limit of a step that uses little CPU (e.g. blocked on a read), ms. */
const WALL_MS = 60_000;
// Linux clock ticks per second for /proc/<pid>/stat times (getconf CLK_TCK; 100 on Linux).
const CLK_TCK = 100;

/** CPU time (user + system) of a process, ms; null where /proc cannot be read. */
function cpuMs(pid: number | undefined): number | null {
  try {
    const stat = readFileSync(`/proc/${pid}/stat`, 'utf8');
    const f = stat.slice(stat.lastIndexOf(')') + 2).split(' ');
    // proc(5): utime and stime are fields 14 and 15, i.e. 12 and 13 after "pid (comm) ".
    return ((Number(f[11]) + Number(f[12])) * 1000) / CLK_TCK;
  } catch {
    return null;
  }
}

/**
 * Watches one step of a child: a hang is HANG_MS of the child's own CPU time (so a machine
 * busy with other work does not turn a slow step into a hang) or WALL_MS of wall-clock time.
 */
function watchdog(pid: number | undefined, onHang: () => void): () => void {
  const t0 = Date.now();
  const cpu0 = cpuMs(pid);
  const timer = setInterval(() => {
    const cpu = cpuMs(pid);
    const wall = Date.now() - t0;
    const used = cpu !== null && cpu0 !== null ? cpu - cpu0 : wall;
    if (used >= HANG_MS || wall >= WALL_MS) {
      clearInterval(timer);
      onHang();
    }
  }, 500);
  return () => clearInterval(timer);
}
const NODE_ARGS = ['--max-old-space-size=1024', '--import', 'tsx'];

export interface Verdict {
  meta: CaseMeta;
  failures: string[];
}

/** The committed small cases, as listed in their manifest. */
export function committedCases(): CaseMeta[] {
  return JSON.parse(readFileSync(join(CASES_DIR, 'manifest.json'), 'utf8')) as CaseMeta[];
}

/** Writes the large cases into `dir` and returns their metadata with paths resolved. */
function prepareLarge(dir: string, cases: HostileCase[]): Job[] {
  return cases.map(({ content, ...meta }) => {
    let path = isAbsolute(meta.file) ? meta.file : join(dir, meta.file);
    if (meta.id === 'directory') path = dir;
    else if (meta.id === 'fifo-no-writer') execFileSync('mkfifo', [path]);
    else if (content !== null) {
      mkdirSync(dirname(path), { recursive: true });
      writeFileSync(path, content);
    }
    return { meta, path, outDir: dir };
  });
}

/** One CLI run as its own process, stdout and stderr piped. */
function runProcess(run: CliRun, path: string, out: string): Promise<CliOutcome> {
  return new Promise((done) => {
    const child = spawn(
      process.execPath,
      [...NODE_ARGS, 'app/cli/main.ts', ...cliArgs(run, path, out)],
      {
        cwd: ROOT,
        stdio: ['ignore', 'pipe', 'pipe'],
      },
    );
    const o: CliOutcome = { run, code: null, stdout: '', stderr: '' };
    child.stdout.setEncoding('utf8').on('data', (t: string) => (o.stdout += t));
    child.stderr.setEncoding('utf8').on('data', (t: string) => (o.stderr += t));
    const stop = watchdog(child.pid, () => {
      o.timedOut = true;
      child.kill('SIGKILL');
    });
    child.on('close', (code, signal) => {
      stop();
      o.code = code;
      if (signal && !o.timedOut) o.crashed = true;
      if (run !== 'plan-json' && run !== 'plan-text') {
        try {
          o.output = readFileSync(out, 'utf8');
        } catch {
          // no output file: judged by exit code and stderr
        }
      }
      done(o);
    });
  });
}

async function runSeparate(job: Job): Promise<string[]> {
  const must = mustRejectOf(job.meta, caseText(job.path));
  const failures: string[] = [];
  for (const run of job.meta.runs ?? ['plan-json']) {
    const o = await runProcess(run, job.path, join(job.outDir, `${job.meta.id}.${run}.sep.out`));
    failures.push(...judgeCli(job.meta, o, must));
  }
  return failures;
}

/** Runs `indices` of `jobs` in run-batch children one after another, restarting after a hang or crash. */
function runBatch(
  jobsFile: string,
  jobs: Job[],
  indices: number[],
  results: string[][],
): Promise<void> {
  return new Promise((done) => {
    let rest = [...indices];
    const startChild = () => {
      if (rest.length === 0) return done();
      const child = spawn(
        process.execPath,
        [...NODE_ARGS, 'tests/hostile/run-batch.ts', jobsFile, rest.join(',')],
        {
          cwd: ROOT,
          stdio: ['ignore', 'pipe', 'pipe'],
        },
      );
      let current: { i: number; run: string } | null = null;
      let stderr = '';
      let buffered = '';
      let stop = () => {};
      let hung = false;
      let started = false;
      child.stderr
        .setEncoding('utf8')
        .on('data', (t: string) => (stderr = (stderr + t).slice(-4000)));
      child.stdout.setEncoding('utf8').on('data', (t: string) => {
        buffered += t;
        let nl: number;
        while ((nl = buffered.indexOf('\n')) >= 0) {
          const msg = JSON.parse(buffered.slice(0, nl)) as {
            start?: number;
            ran?: number;
            run: string;
            failures?: string[];
          };
          buffered = buffered.slice(nl + 1);
          if (msg.start !== undefined) {
            started = true;
            current = { i: msg.start, run: msg.run };
            stderr = '';
            stop();
            stop = watchdog(child.pid, () => {
              hung = true;
              child.kill('SIGKILL');
            });
          } else if (msg.ran !== undefined) {
            stop();
            results[msg.ran].push(...(msg.failures ?? []));
            // The case is finished once its last run has reported.
            const runs = jobs[msg.ran].meta.runs ?? ['plan-json'];
            if (jobs[msg.ran].meta.target !== 'cli' || msg.run === runs[runs.length - 1]) {
              rest = rest.filter((x) => x !== msg.ran);
            }
            current = null;
          }
        }
      });
      child.on('close', (code, signal) => {
        stop();
        if (current) {
          const tail = stderr.trim().split('\n').slice(-3).join(' | ').slice(0, 300);
          results[current.i].push(
            hung
              ? `${current.run}: hang: no answer within ${HANG_MS / 1000} s of CPU time (${WALL_MS / 1000} s of wall time)`
              : `${current.run}: crash (exit ${code ?? signal}): ${tail}`,
          );
          rest = rest.filter((x) => x !== current!.i);
        } else if (rest.length && !started) {
          // The runner could not load (e.g. a module that does not compile): every case left fails with why.
          const why = stderr.trim().split('\n').slice(0, 3).join(' | ').slice(0, 300);
          for (const i of rest)
            results[i].push(`runner could not start (exit ${code ?? signal}): ${why}`);
          rest = [];
        } else if (rest.length) {
          // Died between cases: blame the next case so the run moves on.
          results[rest[0]].push(
            `runner died before the case (exit ${code ?? signal}): ${stderr.slice(-300)}`,
          );
          rest = rest.slice(1);
        }
        startChild();
      });
    };
    startChild();
  });
}

/** Runs the committed cases (from tests/hostile/cases/) and the large ones (made here). */
export async function runCorpus(
  opts: { only?: (c: CaseMeta) => boolean } = {},
): Promise<Verdict[]> {
  const dir = mkdtempSync(join(tmpdir(), 'seedfall-hostile-'));
  try {
    const keep = opts.only ?? (() => true);
    const small: Job[] = committedCases()
      .filter(keep)
      .map((meta) => ({ meta, path: join(CASES_DIR, meta.file), outDir: dir }));
    const jobs = [...small, ...prepareLarge(dir, largeCases().filter(keep))];
    const results: string[][] = jobs.map(() => []);
    const jobsFile = join(dir, 'jobs.json');
    writeFileSync(jobsFile, JSON.stringify(jobs));
    const batched = jobs.map((_, i) => i).filter((i) => !jobs[i].meta.separate);
    const separate = jobs.map((_, i) => i).filter((i) => jobs[i].meta.separate);
    // Two batch children side by side (two cores), then the separate processes two at a time.
    await Promise.all(
      [0, 1].map((k) =>
        runBatch(
          jobsFile,
          jobs,
          batched.filter((_, j) => j % 2 === k),
          results,
        ),
      ),
    );
    const queue = [...separate];
    await Promise.all(
      [0, 1].map(async () => {
        for (let i = queue.shift(); i !== undefined; i = queue.shift())
          results[i].push(...(await runSeparate(jobs[i])));
      }),
    );
    return jobs.map((j, i) => ({ meta: j.meta, failures: results[i] }));
  } finally {
    rmSync(dir, { recursive: true, force: true });
  }
}

if (process.argv[1] && resolve(process.argv[1]) === fileURLToPath(import.meta.url)) {
  const t0 = Date.now();
  void runCorpus().then((verdicts) => {
    const byCat = new Map<string, { held: number; failed: number }>();
    for (const v of verdicts) {
      const k = byCat.get(v.meta.category) ?? { held: 0, failed: 0 };
      if (v.failures.length) {
        k.failed++;
        process.stdout.write(`FAIL [${v.meta.category}] ${v.meta.id}: ${v.failures.join(' / ')}\n`);
      } else k.held++;
      byCat.set(v.meta.category, k);
    }
    for (const [cat, k] of byCat)
      process.stdout.write(`${cat}: ${k.held} held, ${k.failed} failed\n`);
    process.stdout.write(`${verdicts.length} cases in ${Math.round((Date.now() - t0) / 1000)} s\n`);
  });
}
