import { execFileSync, spawnSync } from 'node:child_process';
import { mkdtempSync, readFileSync, rmSync, writeFileSync } from 'node:fs';
import { tmpdir } from 'node:os';
import { join } from 'node:path';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import fc from 'fast-check';
import { jsonSyntaxError, MAX_LISTED_PROBLEMS, runCli as runInProcess } from '../../app/cli';
import { CAUTION_TEXT } from '../../app/brief/caution';
import demo from '../../data/demo-plan.json';

// The CLI contract (app/cli/main.ts header): JSON or text on stdout, exit 0
// when planned, 1 for usage/file errors, 2 for an invalid plan; problems go to stderr.
const TSX = 'node_modules/.bin/tsx';

interface Run {
  status: number;
  stdout: string;
  stderr: string;
}

function runCli(...args: string[]): Run {
  try {
    const stdout = execFileSync(TSX, ['app/cli/main.ts', ...args], {
      encoding: 'utf8',
      stdio: ['ignore', 'pipe', 'pipe'],
      timeout: 60_000,
    });
    return { status: 0, stdout, stderr: '' };
  } catch (e) {
    const err = e as { status: number | null; stdout: string; stderr: string };
    return { status: err.status ?? -1, stdout: err.stdout ?? '', stderr: err.stderr ?? '' };
  }
}

/** Stack-trace lines ("    at fn (file:line)") must never reach the user. */
const STACK_LINE = /^\s+at /m;

let dir: string;
beforeAll(() => {
  dir = mkdtempSync(join(tmpdir(), 'seedfall-cli-'));
});
afterAll(() => {
  rmSync(dir, { recursive: true, force: true });
});

function writePlan(name: string, content: unknown): string {
  const path = join(dir, name);
  writeFileSync(path, typeof content === 'string' ? content : JSON.stringify(content));
  return path;
}

const isLatLon = (p: unknown): boolean => {
  const q = p as { lat: unknown; lon: unknown };
  return Number.isFinite(q?.lat) && Number.isFinite(q?.lon);
};
const isEllipse = (e: unknown): boolean => {
  const q = e as Record<string, unknown>;
  return (
    isLatLon(q.center) &&
    Number.isFinite(q.semiMajor_m) &&
    Number.isFinite(q.semiMinor_m) &&
    Number.isFinite(q.azimuth_deg)
  );
};

describe('CLI json output on the demo plan', () => {
  let run: Run;
  // eslint-disable-next-line @typescript-eslint/no-explicit-any
  let out: any;
  beforeAll(() => {
    run = runCli('data/demo-plan.json', '--format', 'json', '--samples', '400');
    out = JSON.parse(run.stdout);
  }, 60_000);

  it('exits 0 and prints parseable JSON with the declination and one entry per site', () => {
    expect(run.status).toBe(0);
    expect(Number.isFinite(out.declination_deg)).toBe(true);
    expect(out.sites.map((s: { id: string }) => s.id)).toEqual(demo.sites.map((s) => s.id));
    expect(out.caution).toBe(CAUTION_TEXT);
  });

  it('gives every site the contract fields', () => {
    const variantIds = demo.variants.map((v) => v.id);
    for (const s of out.sites) {
      const what = `site ${s.id}`;
      expect(typeof s.id, what).toBe('string');
      expect(variantIds, what).toContain(s.variant);
      expect(s.fallTime_s, what).toBeGreaterThan(0);
      expect(isLatLon(s.nominalLanding), what).toBe(true);
      expect(Number.isFinite(s.reachRadius_m), what).toBe(true);
      expect(typeof s.reachable, what).toBe('boolean');
      expect(isEllipse(s.ellipse95), what).toBe(true);
      expect(isEllipse(s.ellipse50), what).toBe(true);
      expect(Number.isFinite(s.cep_m), what).toBe(true);
      expect(s.pHit, what).toBeGreaterThanOrEqual(0);
      expect(s.pHit, what).toBeLessThanOrEqual(1);
      expect('releaseWindow' in s && 'releaseZone' in s, what).toBe(true);
      if (s.releaseWindow !== null) {
        expect(s.releaseWindow.open_s, what).toBeLessThanOrEqual(s.releaseWindow.close_s);
      }
      expect(
        s.comparison.map((c: { variant: string }) => c.variant),
        what,
      ).toEqual(variantIds);
      expect(variantIds, what).toContain(s.recommended);
      if (s.guidance === 'fixed-heading') {
        expect(Number.isFinite(s.headingTrue_deg), what).toBe(true);
        expect(Number.isFinite(s.headingMag_deg), what).toBe(true);
        expect(Number.isFinite(s.thrustTime_s), what).toBe(true);
      }
    }
  });

  it('has at least one fixed-heading site in the demo (the pinned vane-steer one)', () => {
    expect(out.sites.some((s: { guidance: string }) => s.guidance === 'fixed-heading')).toBe(true);
  });
});

describe('CLI text output', () => {
  it('--format text contains the caution', () => {
    const run = runCli('data/demo-plan.json', '--format', 'text', '--samples', '200');
    expect(run.status).toBe(0);
    expect(run.stdout).toContain(CAUTION_TEXT);
    for (const s of demo.sites) expect(run.stdout).toContain(s.id);
  }, 60_000);
});

describe('CLI errors', () => {
  it('a bad plan exits non-zero and lists every problem with its field path, no stack trace', () => {
    const bad = structuredClone(demo) as Record<string, any>; // eslint-disable-line @typescript-eslint/no-explicit-any
    bad.release.lat = 123;
    bad.variants[0].descentRate_mps = -1;
    bad.sites[3].tolerance_m = 'wide';
    const run = runCli(writePlan('bad.json', bad), '--format', 'json');
    expect(run.status).not.toBe(0);
    expect(run.stdout).toBe('');
    for (const path of ['release.lat', 'variants[0].descentRate_mps', 'sites[3].tolerance_m']) {
      expect(run.stderr).toContain(path);
    }
    expect(run.stderr).toMatch(/3 problem/);
    expect(run.stderr).not.toMatch(STACK_LINE);
  }, 60_000);

  it('an unknown variant id is named', () => {
    const bad = structuredClone(demo);
    bad.sites[0] = { ...bad.sites[0], variant: 'no-such-spinner' };
    const run = runCli(writePlan('unknown-variant.json', bad));
    expect(run.status).not.toBe(0);
    expect(run.stderr).toContain('sites[0].variant');
    expect(run.stderr).toContain('no-such-spinner');
    expect(run.stderr).not.toMatch(STACK_LINE);
  }, 60_000);

  it('a missing file gives a clear message', () => {
    const run = runCli(join(dir, 'does-not-exist.json'));
    expect(run.status).not.toBe(0);
    expect(run.stderr).toMatch(/cannot read .*does-not-exist\.json/);
    expect(run.stderr).toContain('ENOENT');
    expect(run.stderr).not.toMatch(STACK_LINE);
  }, 60_000);

  it('a file that is not JSON gives a clear message', () => {
    const run = runCli(writePlan('not-json.json', '{ "format": "seedfall-plan", '));
    expect(run.status).not.toBe(0);
    expect(run.stderr).toMatch(/not valid JSON/);
    expect(run.stderr).not.toMatch(STACK_LINE);
  }, 60_000);
});

/** The CLI's own entry in this process: exit code and what it wrote. */
async function inProcess(...args: string[]): Promise<Run> {
  const run: Run = { status: -1, stdout: '', stderr: '' };
  run.status = await runInProcess(args, {
    out: (t) => void (run.stdout += t),
    err: (t) => void (run.stderr += t),
  });
  return run;
}

describe('CLI file reading', () => {
  const oneLine = (run: Run) => {
    expect(run.stderr.trim().split('\n')).toHaveLength(1);
    expect(run.stderr).not.toMatch(STACK_LINE);
  };

  it('reads a plan after a UTF-8 byte-order mark, as the site importers do', async () => {
    // Unicode 15 §23.8: U+FEFF at the start of UTF-8 text is a signature, not content.
    const run = await inProcess(
      writePlan('bom.json', `\uFEFF${JSON.stringify(demo)}`),
      '--samples',
      '50',
    );
    expect(run.stderr).toBe('');
    expect(run.status).toBe(0);
  });

  it('stops reading an endless device at the 32 MiB bound with a one-line file error', async () => {
    // common practice (bounded reads)
    const run = await inProcess('/dev/zero');
    expect(run.status).toBe(1);
    expect(run.stderr).toMatch(/larger than 32 MiB/);
    oneLine(run);
  });

  it('refuses a directory, UTF-16 text and bytes that are not UTF-8 as file errors', async () => {
    // RFC 3629 §3 (0xE9 alone is not UTF-8); Unicode 15 §23.8 (FF FE starts UTF-16LE)
    const dirRun = await inProcess(dir);
    expect(dirRun.status).toBe(1);
    expect(dirRun.stderr).toMatch(/is a directory/);
    const utf16 = join(dir, 'utf16.json');
    writeFileSync(utf16, Buffer.concat([Buffer.from([0xff, 0xfe]), Buffer.from('{}', 'utf16le')]));
    const u = await inProcess(utf16);
    expect(u.status).toBe(1);
    expect(u.stderr).toMatch(/UTF-16/);
    const latin1 = join(dir, 'latin1.json');
    writeFileSync(latin1, Buffer.from([0x7b, 0x0a, 0x22, 0xe9, 0x22, 0x7d]));
    const l = await inProcess(latin1);
    expect(l.status).toBe(1);
    expect(l.stderr).toMatch(/not UTF-8 text \(line 2, byte 4\)/);
    for (const run of [dirRun, u, l]) oneLine(run);
  });

  it('names the line and column of a JSON syntax error', async () => {
    // RFC 8259 §4: a value must follow the name separator; the "}" at line 3, column 8 is the error.
    const run = await inProcess(writePlan('syntax.json', '{\n  "a": 1,\n  "b": }\n'));
    expect(run.status).toBe(2);
    expect(run.stderr).toMatch(/expected a value, found '}' at line 3, column 8/);
    const empty = await inProcess(writePlan('empty.json', ''));
    expect(empty.status).toBe(2);
    expect(empty.stderr).toMatch(/is empty/);
  });

  it('finds a JSON syntax error exactly when JSON.parse does', () => {
    // Reference parser: V8's JSON.parse (ECMA-262 §25.5.1, RFC 8259 grammar); texts are valid JSON,
    // cut short, or with up to three characters put in.
    fc.assert(
      fc.property(fc.json(), fc.nat(), fc.string({ maxLength: 3 }), (text, at, extra) => {
        const k = at % (text.length + 1);
        for (const t of [text, text.slice(0, k), text.slice(0, k) + extra + text.slice(k)]) {
          let parses = true;
          try {
            JSON.parse(t);
          } catch {
            parses = false;
          }
          expect(jsonSyntaxError(t) === null, JSON.stringify(t)).toBe(parses);
        }
      }),
      { numRuns: 1000 },
    );
  });

  it('shows control characters and bidi overrides from the file as escapes, not raw', async () => {
    // Unicode TR #36 §2.1 (bidirectional spoofing); ECMA-48 (ESC starts a control sequence)
    const bad = { ...structuredClone(demo), ['\u001b[2J\u202Ex']: 1 };
    const run = await inProcess(writePlan('controls.json', bad));
    expect(run.status).toBe(2);
    expect(run.stderr.includes('\u001b') || run.stderr.includes('\u202e')).toBe(false);
    expect(run.stderr).toContain('\\u{202E}');
  });

  it('refuses to write the brief or an export over the plan file itself', async () => {
    // common practice: bad input loses nothing, the plan included
    const path = writePlan('keep.json', demo);
    const before = JSON.stringify(demo);
    const viaDot = join(dir, '.', 'keep.json');
    const run = await inProcess('export', path, '--format', 'csv', '--out', viaDot);
    expect(run.status).toBe(1);
    expect(run.stderr).toMatch(/is the plan file itself/);
    const brief = await inProcess('brief', path, '--out', path);
    expect(brief.status).toBe(1);
    expect(readFileSync(path, 'utf8')).toBe(before);
  });

  it('reports an unexpected error in one line with exit 3 and no stack trace', async () => {
    // common practice: the documented exit code for internal errors
    const lines: string[] = [];
    const code = await runInProcess(['data/demo-plan.json', '--samples', '20'], {
      out: () => {
        throw new TypeError('stdout went away');
      },
      err: (t) => void lines.push(t),
    });
    expect(code).toBe(3);
    expect(lines.join('')).toBe('seedfall: internal error: TypeError: stdout went away\n');
  });

  it('lists the first problems of a 10,000-problem plan completely when stderr is a pipe', () => {
    // common practice: output to a pipe is flushed before exit (no process.exit() mid-write).
    // Each problem names an unknown variant and lists 12 known 64-character ids, so the 200
    // listed lines (about 180 KB) are more than a pipe buffer (64 KiB on Linux, pipe(7)).
    const bad = structuredClone(demo) as Record<string, unknown>;
    bad.variants = Array.from({ length: 12 }, (_, i) => ({
      id: `${i}`.padStart(64, 'v'),
      guidance: 'passive',
      descentRate_mps: 3,
    }));
    bad.sites = Array.from({ length: 10_000 }, (_, i) => ({
      id: `x${i}`,
      lat: 47.49,
      lon: 21.08,
      variant: 'u'.repeat(64),
    }));
    const r = spawnSync(TSX, ['app/cli/main.ts', writePlan('many.json', bad)], {
      encoding: 'utf8',
      stdio: ['ignore', 'pipe', 'pipe'],
      timeout: 60_000,
    });
    expect(r.status).toBe(2);
    const lines = r.stderr.split('\n');
    expect(lines.pop()).toBe(''); // ends with a newline: the last line is whole
    const total = Number(/\((\d+) problems\)/.exec(lines[0])?.[1]);
    expect(total).toBeGreaterThanOrEqual(10000);
    expect(lines.filter((l) => l.startsWith('  - '))).toHaveLength(MAX_LISTED_PROBLEMS);
    expect(lines.at(-1)).toBe(`  … and ${total - MAX_LISTED_PROBLEMS} more problems`);
    expect(lines.at(-2)).toMatch(/^ {2}- sites\[\d+\]\.variant .*\(known: .*\)$/);
    expect(r.stderr.length).toBeGreaterThan(128 * 1024);
  }, 60_000);

  it('prints a brief to PDF in which a script payload from the plan is plain text', () => {
    // OWASP XSS Filter Evasion Cheat Sheet; text read back with poppler's pdftotext
    const plan = { ...structuredClone(demo), name: '<img src=x onerror=alert(1)>' };
    const pdf = join(dir, 'payload.pdf');
    const run = runCli('brief', writePlan('payload.json', plan), '--pdf', pdf, '--samples', '50');
    expect(run.status).toBe(0);
    expect(execFileSync('pdftotext', [pdf, '-']).toString()).toContain(
      'Drop brief: <img src=x onerror=alert(1)>',
    );
  }, 90_000);
});
