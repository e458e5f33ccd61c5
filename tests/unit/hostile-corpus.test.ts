/**
 * The bad-input corpus (tests/hostile/, README there): every case must hold — no script in any
 * output, no crash or native trace, no hang over 20 s, no silent acceptance of a value outside
 * the documented ranges, and importers that report what they drop and never hand the plan a value
 * it rejects. Failing cases are listed by id with their cause.
 */
import { mkdirSync, mkdtempSync, readFileSync, readdirSync, rmSync, writeFileSync } from 'node:fs';
import { tmpdir } from 'node:os';
import { join, relative } from 'node:path';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import {
  formulaCells,
  judgeCli,
  judgeImport,
  schemaViolations,
  type CaseMeta,
  type Category,
  type CliOutcome,
} from '../hostile/judge';
import { CASES_DIR, basePlan, writeSmallCases } from '../hostile/make-corpus';
import { runCorpus, type Verdict } from '../hostile/run-corpus';

const meta = (extra: Partial<CaseMeta> = {}): CaseMeta => ({
  id: 'self-check',
  file: 'x.json',
  category: 'ranges',
  target: 'cli',
  probes: 'self-check',
  source: 'common practice',
  ...extra,
});
const outcome = (extra: Partial<CliOutcome>): CliOutcome => ({
  run: 'plan-json',
  code: 0,
  stdout: '{"sites":[]}',
  stderr: '',
  ...extra,
});

// The judge must be able to fail: each verdict rule is shown failing on a made-up outcome.
describe('the corpus judge', () => {
  it('reads the documented ranges without ajv: the filled demo plan is inside them, 1e-320 m/s is not', () => {
    // plan.schema.json: descentRate_mps has a positive least value.
    expect(schemaViolations(basePlan())).toEqual([]);
    const p = basePlan() as { variants: { descentRate_mps: number }[] };
    p.variants[0].descentRate_mps = 1e-320;
    expect(schemaViolations(p)).toEqual([
      expect.stringMatching(/^variants\[0\]\.descentRate_mps: /),
    ]);
  });

  it('fails exit 0 on a plan outside its ranges, a null where a number is promised, and a V8 trace', () => {
    // common practice
    expect(judgeCli(meta(), outcome({}), ['x: above 1'])).toEqual([
      expect.stringContaining('silent acceptance'),
    ]);
    const nulls = JSON.stringify({ sites: [{ id: 'a', cep_m: null, releaseWindow: null }] });
    expect(judgeCli(meta(), outcome({ stdout: nulls }), []).join()).toMatch(
      /null .*sites\[0\]\.cep_m/,
    );
    expect(judgeCli(meta(), outcome({ code: 133, stderr: 'FATAL ERROR: heap' }), []).length).toBe(
      2,
    );
    expect(
      judgeCli(meta(), outcome({ code: 3, stderr: 'seedfall: internal error: x' }), []),
    ).not.toEqual([]);
    expect(judgeCli(meta(), outcome({ timedOut: true }), [])).toEqual([
      expect.stringContaining('hang'),
    ]);
    const brief = outcome({
      run: 'brief',
      stdout: '',
      output: '<td>reach</td><td>Infinity m</td>',
    });
    expect(judgeCli(meta(), brief, [])).toEqual(['brief: prints "Infinity"']);
    const payload = '<img src=x onerror=alert(1)>';
    const kml = outcome({ run: 'kml', stdout: '', output: `<name>${payload}</name>` });
    expect(judgeCli(meta({ payload }), kml, [])).toEqual([expect.stringContaining('unescaped')]);
  });

  it('fails an invalid-plan report whose problem names no field, and passes one that does', () => {
    // CONVENTIONS: messages name the field path and the allowed range.
    const stderr = (line: string) => `seedfall: f is not a valid plan (1 problem):\n  - ${line}\n`;
    const m = meta({ path: 'release.lat' });
    const must = ['release.lat: above 90'];
    expect(
      judgeCli(m, outcome({ code: 2, stderr: stderr('Maximum call stack size exceeded') }), must),
    ).not.toEqual([]);
    expect(
      judgeCli(m, outcome({ code: 2, stderr: stderr('plan could not be checked: x') }), must),
    ).not.toEqual([]);
    expect(
      judgeCli(m, outcome({ code: 2, stderr: stderr('release.lat must be a number') }), must),
    ).not.toEqual([]);
    expect(
      judgeCli(
        m,
        outcome({ code: 2, stderr: stderr('release.lat must be between -90 and 90') }),
        must,
      ),
    ).toEqual([]);
  });

  it('finds spreadsheet formula cells but not negative numbers', () => {
    // OWASP CSV Injection
    expect(formulaCells('a,b\n=1+1,-3.5\n"@x",\'=1\n')).toEqual(['=1+1', '@x']);
  });

  it('fails an importer that drops items unreported or hands the plan an invalid value', () => {
    // common practice
    const m = meta({ target: 'sites', category: 'import', items: 3 });
    expect(
      judgeImport(m, { kept: 1, problems: [{ where: 'line 2', message: 'x' }], planErrors: [] }),
    ).not.toEqual([]);
    expect(
      judgeImport(m, {
        kept: 3,
        problems: [],
        planErrors: ['sites must have at most 1000 entries'],
      }),
    ).not.toEqual([]);
    expect(
      judgeImport(m, {
        kept: 1,
        problems: [{ message: 'only the first 1 sites were read' }],
        planErrors: [],
      }),
    ).toEqual([]);
  });
});

describe('the committed corpus', () => {
  it('is what tests/hostile/make-corpus.ts makes from the current schema and demo plan', () => {
    // Regenerate after a schema change with: npx tsx tests/hostile/make-corpus.ts
    const dir = mkdtempSync(join(tmpdir(), 'seedfall-corpus-'));
    try {
      writeSmallCases(dir);
      const list = (root: string): string[] =>
        readdirSync(root, { recursive: true, withFileTypes: true })
          .filter((d) => d.isFile())
          .map((d) => relative(root, join(d.parentPath, d.name)))
          .sort();
      const want = list(dir);
      expect(list(CASES_DIR), 'run: npx tsx tests/hostile/make-corpus.ts').toEqual(want);
      const stale = want.filter(
        (f) => !readFileSync(join(dir, f)).equals(readFileSync(join(CASES_DIR, f))),
      );
      expect(stale, 'run: npx tsx tests/hostile/make-corpus.ts').toEqual([]);
    } finally {
      rmSync(dir, { recursive: true, force: true });
    }
  }, 60_000);
});

describe('every case of the bad-input corpus holds', () => {
  let verdicts: Verdict[] = [];
  beforeAll(async () => {
    verdicts = await runCorpus();
    // A readable list for people: test-output/ is git-ignored.
    mkdirSync('test-output', { recursive: true });
    writeFileSync(
      'test-output/hostile-report.txt',
      verdicts
        .map(
          (v) =>
            `${v.failures.length ? 'FAIL' : 'held'} [${v.meta.category}] ${v.meta.id}: ${v.failures.join(' / ')}`,
        )
        .join('\n') + '\n',
    );
  }, 900_000);
  afterAll(() => {
    verdicts = [];
  });

  const failing = (cat: Category) =>
    verdicts
      .filter((v) => v.meta.category === cat && v.failures.length)
      .map((v) => `${v.meta.id}: ${v.failures.join(' / ')}`);

  it('runs every committed case and the large ones made at run time', () => {
    const ids = new Set(verdicts.map((v) => v.meta.id));
    expect(ids.size).toBe(verdicts.length);
    for (const id of [
      'dev-zero',
      'fifo-no-writer',
      'problems-10000',
      'sites-1000-brief-export',
      'csv-1m-rows',
      'bom-demo',
    ]) {
      expect(ids.has(id), id).toBe(true);
    }
  });

  // Bounded reads, byte-order marks, encodings and JSON syntax (RFC 8259, RFC 3629).
  it('file cases: every bad file is refused in one line or with its line and column', () => {
    expect(failing('file')).toEqual([]);
  });

  // plan.schema.json ranges, required fields, types, cross-field rules, nesting, array limits.
  it('range and shape cases: no crash, no null or non-finite result, no silent acceptance', () => {
    expect(failing('ranges')).toEqual([]);
  });

  // OWASP XSS Filter Evasion Cheat Sheet payloads in every text field, through brief and exports.
  it('script cases: payloads stay text in the brief and every export', () => {
    expect(failing('script')).toEqual([]);
  });

  // OWASP CSV Injection; a plan at the 1,000-site maximum through export and brief.
  it('scale and CSV cases: no formula cells, the largest plan exports within the hang limit', () => {
    expect(failing('scale')).toEqual([]);
  });

  // Importers: RFC 4180, RFC 7946, OGC KML 2.2, the NWS FB layout, and the panel's reading ranges.
  it('importer cases: no throw, every dropped item reported, the result fits the plan schema', () => {
    expect(failing('import')).toEqual([]);
  });
});
