import { execFileSync } from 'node:child_process';
import { mkdtempSync, readFileSync, writeFileSync } from 'node:fs';
import { tmpdir } from 'node:os';
import { join } from 'node:path';
import { describe, expect, it } from 'vitest';
import { briefHtml, briefTimes, scheduleOrder } from '../../app/brief/brief-html';
import { fallTurbulenceText } from '../../app/brief/uncertainty-text';
import { pHitText } from '../../app/planner';
import { planDrop } from '../../app/planner/planner';
import { validatePlan } from '../../app/plan/validate';
import demo from '../../data/demo-plan.json';

function demoPlan(patch: (d: typeof demo) => void = () => {}) {
  const d = structuredClone(demo);
  patch(d);
  d.monteCarlo.samples = 200;
  const v = validatePlan(d);
  if (!v.ok) throw new Error(v.errors.map((e) => e.message).join('; '));
  return { plan: v.plan, result: planDrop(v.plan) };
}

describe('the drop brief', () => {
  const { plan, result } = demoPlan();
  const html = briefHtml(plan, result, { generatedAt: new Date('2026-12-01T07:00:00Z') });

  it('lists every site once in the release schedule, in release-time order on a moving track', () => {
    for (const s of result.sites) {
      expect(html.match(new RegExp(`<tr data-site="${s.id}">`, 'g'))?.length).toBe(1);
    }
    const order = scheduleOrder(result).map((s) => s.release.time_s);
    expect(order).toEqual([...order].sort((a, b) => a - b));
    const positions = scheduleOrder(result).map((s) => html.indexOf(`<tr data-site="${s.id}">`));
    expect(positions).toEqual([...positions].sort((a, b) => a - b));
  });

  it('prints the planner’s P(hit) ± its standard error and CEP for each site', () => {
    for (const s of result.sites) {
      const row = html.slice(html.indexOf(`<tr data-site="${s.id}">`));
      // Binomial standard error of a share of n = 200 samples, √(p(1−p)/n) (common practice).
      const se = Math.sqrt((s.pHit * (1 - s.pHit)) / 200);
      const cell = /data-col="phit">(.*?)<\/td>/
        .exec(row)![1]
        .replace(/<[^>]+>/g, '')
        .replace(/&lt;/g, '<');
      expect(cell).toBe(`${s.pHit.toFixed(2)} ± ${se < 0.005 ? '<0.01' : se.toFixed(2)}`);
      expect(row).toContain(`data-col="cep">${(Number(s.cep_m.toFixed(1)) || 0).toFixed(1)}<`);
    }
  });

  // common practice: a schedule never prints an edge the search did not find as if it were exact.
  it('marks a window edge at the search limit as "before" / "after"', () => {
    const r = structuredClone(result);
    const s = r.sites.find((x) => x.releaseWindow)!;
    s.releaseWindow!.openUnbounded = true;
    s.releaseWindow!.closeUnbounded = true;
    const marked = briefHtml(plan, r, { generatedAt: new Date('2026-12-01T07:00:00Z') });
    const row = marked.slice(marked.indexOf(`<tr data-site="${s.id}">`));
    expect(row.slice(0, row.indexOf('</tr>'))).toMatch(/before [+−][\d.]+ … after [+−][\d.]+ s/);
    expect(html).not.toContain('before +');
  });

  it('says which error sources P(hit) includes, gusts and vertical air with their sizes', () => {
    const unc = html.slice(html.indexOf('<h2>Uncertainty (1σ)</h2>'));
    const section = unc.slice(0, unc.indexOf('</section>'));
    // The demo plan leaves turbulence at its default, auto (docs/plan-format.md).
    expect(html).toContain(
      'Included error sources: forecast wind error, gusts, vertical air, descent rate',
    );
    expect(section).toMatch(/data-source="gust"><b>gusts<\/b>: modelled: turbulence from the plan/);
    expect(section).toMatch(/in the sites’ falls [\d.–]+ m\/s per component, correlation time/);
    expect(section).toContain('data-source="verticalAir"');
    expect(section).toContain('n = 200 samples');
    const { plan: calmPlan, result: calm } = demoPlan((d) => {
      (d.uncertainty as Record<string, unknown>).turbulence = 'none';
    });
    const calmHtml = briefHtml(calmPlan, calm);
    expect(calmHtml).toContain('Included error sources: forecast wind error, descent rate');
    expect(calmHtml).not.toContain('data-source="gust"');
    expect(calmHtml).not.toContain('data-source="verticalAir"');
  });

  it('names a set gust as set, with the sites’ falls flying exactly that gust', () => {
    const { plan: p, result: r } = demoPlan((d) => {
      Object.assign(d.uncertainty, { turbulence: 'none', gust_mps: 1.5, gustTime_s: 4 });
    });
    const h = briefHtml(p, r);
    expect(h).toContain(
      '<b>gusts</b>: 1.5 m/s per component (set); correlation time 4 s (set); in the sites’ falls 1.5 m/s per component, correlation time 4.0 s',
    );
    // Turbulence "none" with a set gust flies that gust and nothing else (the plan-format rule).
    expect(h).not.toContain('data-source="verticalAir"');
  });

  it('names no variant for a site no variant can reach, and prints each variant’s touchdown energy', () => {
    const lost = result.sites.filter((s) => s.recommendation.kind === 'unreachable' && !s.pinned);
    expect(lost.length).toBeGreaterThan(0);
    for (const s of lost) {
      const row = html.slice(html.indexOf(`<tr data-site="${s.id}">`));
      const cells = row.slice(0, row.indexOf('</tr>'));
      expect(cells).toContain('no variant can reach this site');
      expect(cells).not.toContain(`${s.variant}<`);
    }
    // One row per variant with mass, speed and energy ½·m·v² in J and ft-lbf (1 ft-lbf =
    // 0.3048 m × 4.4482216152605 N, NIST SP 811 App. B).
    for (const v of plan.variants) {
      const row = new RegExp(`<tr data-variant="${v.id}">(.*?)</tr>`, 's').exec(html)![1];
      const nums = [...row.matchAll(/<td class="num[^"]*">([\d.]+)<\/td>/g)].map((m) =>
        Number(m[1]),
      );
      const [, mass, , , speed, joules, ftlbf] = nums;
      expect(joules).toBeCloseTo(0.5 * mass * speed * speed, 0);
      expect(ftlbf).toBeCloseTo(joules / (0.3048 * 4.4482216152605), 0);
    }
    expect(html).toContain('Local rules govern');
  });

  it('draws the wind profile and the hodograph', () => {
    expect(html).toContain('aria-label="Wind profile"');
    expect(html).toContain('aria-label="Hodograph"');
  });

  it('carries the caution, the declination with its model, and sign-off lines', () => {
    expect(html).toContain('airspace authorisation');
    expect(html).toContain('WMM-2025');
    expect(html).toContain('Prepared by');
    expect(html).toContain('Approved by');
  });

  it('shows plan text as text, never as markup', () => {
    const { plan: p2, result: r2 } = demoPlan((d) => {
      d.name = '<script>alert(1)</script> & "co"';
      d.sites[0].name = '<img src=x onerror=alert(1)>';
    });
    const h = briefHtml(p2, r2);
    expect(h).not.toContain('<script>alert');
    expect(h).not.toContain('<img src=x');
    expect(h).toContain('&lt;script&gt;alert(1)&lt;/script&gt; &amp; &quot;co&quot;');
  });

  it('gives the local clock time with its zone and the same instant in UTC', () => {
    // 09:30 at UTC+01:00 is 08:30 UTC (ISO 8601 offsets).
    expect(briefTimes('2026-12-01T09:30:00+01:00')).toEqual({
      date: '2026-12-01',
      local: '09:30 UTC+01:00',
      utc: '08:30 UTC 2026-12-01',
    });
    expect(briefTimes('2026-06-30T23:15:00-05:00').utc).toBe('04:15 UTC 2026-07-01');
  });

  it('sets the paper size for the cover and landscape for the pages after it', () => {
    const letter = briefHtml(plan, result, { paper: 'Letter' });
    expect(letter).toMatch(/@page \{\s*size: Letter;/);
    expect(letter).toContain('@page wide { size: Letter landscape;');
  });
});

describe('the brief from the command line', () => {
  it('writes the same brief to a file and reports bad options', () => {
    const dir = mkdtempSync(join(tmpdir(), 'seedfall-brief-'));
    const out = join(dir, 'brief.html');
    execFileSync(
      'node_modules/.bin/tsx',
      ['app/cli/main.ts', 'brief', 'data/demo-plan.json', '--out', out],
      {
        stdio: 'pipe',
      },
    );
    const text = readFileSync(out, 'utf8');
    expect(text.startsWith('<!doctype html>')).toBe(true);
    expect(text).toContain('Release schedule');
    expect(text).not.toContain('against release altitude');
    // With --sweep the brief adds the P(hit)/CEP-against-altitude plot for that site.
    execFileSync(
      'node_modules/.bin/tsx',
      [
        'app/cli/main.ts',
        'brief',
        'data/demo-plan.json',
        '--out',
        out,
        '--samples',
        '200',
        '--sweep',
        's02:plain-drifter',
      ],
      { stdio: 'pipe' },
    );
    const withSweep = readFileSync(out, 'utf8');
    expect(withSweep).toContain('P(hit) and CEP against release altitude');
    expect(withSweep).toContain('s02 · plain-drifter');
    const bad = join(dir, 'bad.json');
    writeFileSync(bad, '{"format":"seedfall-plan","version":1}');
    let err = '';
    try {
      execFileSync('node_modules/.bin/tsx', ['app/cli/main.ts', 'brief', bad, '--out', out], {
        stdio: 'pipe',
      });
    } catch (e) {
      err = String((e as { stderr: Buffer }).stderr);
    }
    expect(err).toContain('release is required');
    let err2 = '';
    try {
      execFileSync(
        'node_modules/.bin/tsx',
        ['app/cli/main.ts', 'brief', 'data/demo-plan.json', '--paper', 'A5', '--out', out],
        {
          stdio: 'pipe',
        },
      );
    } catch (e) {
      err2 = String((e as { stderr: Buffer }).stderr);
    }
    expect(err2).toContain('--paper must be A4 or Letter');
    // Four CLI runs (tsx start-up and a plan each): seconds apiece on a loaded 2-core machine.
  }, 180_000);
});

describe('P(hit) and turbulence in words', () => {
  // Two decimals for both, "± <0.01" when the error rounds to 0.00 (issue 11's form "0.91 ± 0.01").
  it('writes P(hit) ± its standard error to two decimals', () => {
    // √(0.5·0.5/2000) = 0.01118; √(0.97·0.03/2000) = 0.00381; √(0.5·0.5/200) = 0.03536.
    expect(pHitText(0.5, Math.sqrt(0.25 / 2000))).toBe('0.50 ± 0.01');
    expect(pHitText(0.97, Math.sqrt((0.97 * 0.03) / 2000))).toBe('0.97 ± <0.01');
    expect(pHitText(0.5, Math.sqrt(0.25 / 200))).toBe('0.50 ± 0.04');
    expect(pHitText(1, 0)).toBe('1.00 ± <0.01');
    expect(pHitText(0.0001, 0.0002)).toBe('0.00 ± <0.01');
    expect(pHitText(Number.NaN, 0.01)).toBe('–');
    expect(pHitText(0.91)).toBe('0.91');
  });

  it('gives one fall’s gust and vertical air, "none" where there is none', () => {
    expect(fallTurbulenceText({ gust_mps: 0.84, gustTime_s: 3.16, verticalAir_mps: 0.42 })).toBe(
      'gust 1σ 0.8 m/s, correlation time 3.2 s · vertical air 1σ 0.4 m/s',
    );
    expect(fallTurbulenceText({ gust_mps: 0, gustTime_s: 0, verticalAir_mps: 0 })).toBe(
      'gust none · vertical air none',
    );
  });
});
