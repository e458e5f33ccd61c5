import { execFileSync } from 'node:child_process';
import { mkdirSync, readFileSync } from 'node:fs';
import type { Browser } from 'playwright-core';
import { afterAll, beforeAll, describe, expect, inject, it } from 'vitest';
import { launch, watchErrors } from './browser';

let browser: Browser;
beforeAll(async () => {
  browser = await launch();
});
afterAll(async () => {
  await browser?.close();
});

const num = (s: string): number => Number(s.replace('−', '-').replace('+', ''));

describe('the printed brief', () => {
  it('prints to PDF with the planner’s numbers in the release schedule', async () => {
    const context = await browser.newContext({ viewport: { width: 1280, height: 800 } });
    const page = await context.newPage();
    const errors = watchErrors(page);
    await page.goto(inject('baseUrl'));
    await page.locator('[data-testid=planned]').waitFor({ timeout: 30_000 });

    // What the planner shows, per site: P(hit) ± its standard error, CEP and the window.
    const shown = new Map<string, { pHit: string; cep: number; window: number[] | null }>();
    for (const row of await page.locator('sf-results-table tbody tr').all()) {
      const cells = await row.locator('td').allInnerTexts();
      const w = /(-?[\d.]+)…(-?[\d.]+)/.exec(cells[5]);
      shown.set(cells[0].trim(), {
        pHit: cells[2].trim(),
        cep: Number(cells[3].replace(' m', '')),
        window: w ? [Number(w[1]), Number(w[2])] : null,
      });
    }
    expect(shown.size).toBe(12);

    const [brief] = await Promise.all([
      context.waitForEvent('page'),
      page.getByRole('button', { name: 'Brief' }).click(),
    ]);
    await brief.waitForLoadState('load');
    await expect(brief.locator('h1').innerText()).resolves.toContain('Drop brief');
    mkdirSync('test-output/brief', { recursive: true });
    const pdf = 'test-output/brief/brief.pdf';
    await brief.pdf({ path: pdf, format: 'A4', printBackground: true, preferCSSPageSize: true });
    // Pages as pictures for a person to look at (poppler's pdftoppm), and the text (pdftotext).
    execFileSync('pdftoppm', ['-r', '70', '-png', pdf, 'test-output/brief/page']);
    const text = execFileSync('pdftotext', ['-layout', pdf, '-']).toString();
    const pages = text.split('\f').filter((p) => p.trim()).length;
    expect(pages).toBeGreaterThanOrEqual(3);

    const found = new Set<string>();
    const lines = text.split('\n');
    lines.forEach((line, i) => {
      const m = /^\s*(\d+) (s\d+)\s.*\s(\d\.\d\d)\s+(\d+\.\d)\s*$/.exec(line);
      if (!m) return;
      const site = shown.get(m[2]);
      expect(site, `site ${m[2]} of the PDF is in the planner`).toBeDefined();
      // P(hit) on the row's line, its standard error ("± 0.01") printed small under it.
      const se = /± (<?0\.\d\d)/.exec(lines.slice(i, i + 6).join(' '));
      expect(`${m[3]} ± ${se?.[1]}`).toBe(site!.pHit);
      expect(Number(m[4])).toBe(site!.cep);
      const w = /([−+]?[\d.]+) … ([−+]?[\d.]+) s/.exec(line);
      if (site!.window) {
        expect(w, `window of ${m[2]}`).not.toBeNull();
        expect([num(w![1]), num(w![2])]).toEqual(site!.window);
      } else {
        expect(line).toContain('no window');
      }
      found.add(m[2]);
    });
    expect(found.size).toBe(12);
    expect(text).toContain('airspace authorisation');
    expect(errors).toEqual([]);
    await context.close();
  });
});

/** Text of the h2/h3 headings of an HTML document, as printed (tags dropped, entities read). */
function headings(html: string): string[] {
  return [...html.matchAll(/<h[23][^>]*>(.*?)<\/h[23]>/gs)].map((m) =>
    m[1]
      .replace(/<[^>]+>/g, '')
      .replace(/&lt;/g, '<')
      .replace(/&gt;/g, '>')
      .replace(/&quot;/g, '"')
      .replace(/&#39;/g, "'")
      .replace(/&amp;/g, '&')
      .replace(/\s+/g, ' ')
      .trim(),
  );
}

/** Per page of a PDF: its height and the lowest text above the footer margin, pt (pdftotext -bbox). */
function pageExtents(pdf: string): { height: number; bottom: number }[] {
  const xml = execFileSync('pdftotext', ['-bbox', pdf, '-']).toString();
  return xml
    .split('<page ')
    .slice(1)
    .map((page) => {
      const height = Number(/height="([\d.]+)"/.exec(page)![1]);
      // The footer prints in the bottom margin (13–14 mm ≈ 37–40 pt); content ends above it.
      const ys = [...page.matchAll(/yMax="([\d.]+)"/g)]
        .map((m) => Number(m[1]))
        .filter((y) => y < height - 36);
      return { height, bottom: Math.max(0, ...ys) };
    });
}

describe('the brief printed to PDF from the command line', () => {
  for (const paper of ['A4', 'Letter'] as const) {
    it(`numbers its ${paper} pages, keeps headings with their text, fills its pages and lists zones and hazard corners`, () => {
      const dir = 'test-output/brief';
      mkdirSync(dir, { recursive: true });
      const base = `${dir}/cli-${paper.toLowerCase()}`;
      // The demo plan has a no-drop zone ("Dyke road") and a forecast (the timeline section).
      execFileSync(
        'node_modules/.bin/tsx',
        [
          'app/cli/main.ts',
          'brief',
          'data/demo-plan.json',
          '--paper',
          paper,
          '--sweep',
          's01',
        ].concat(['--out', `${base}.html`, '--pdf', `${base}.pdf`]),
        { stdio: 'pipe' },
      );
      // Pages as pictures for a person to look at (poppler's pdftoppm).
      execFileSync('pdftoppm', ['-r', '60', '-png', `${base}.pdf`, base]);
      const info = execFileSync('pdfinfo', [`${base}.pdf`]).toString();
      const pages = Number(/^Pages:\s+(\d+)/m.exec(info)![1]);
      // The demo brief: cover, schedule, timeline, winds, checks, zones and hazard (common practice).
      expect(pages).toBeGreaterThanOrEqual(5);
      expect(pages).toBeLessThanOrEqual(12);
      const html = readFileSync(`${base}.html`, 'utf8');
      const heads = headings(html);
      expect(heads).toContain('No-drop zones');
      expect(heads).toContain('Hazard area — keep people clear');

      const texts: string[] = [];
      const lineCounts: number[] = [];
      for (let n = 1; n <= pages; n++) {
        const text = execFileSync('pdftotext', [
          '-layout',
          '-f',
          String(n),
          '-l',
          String(n),
          `${base}.pdf`,
          '-',
        ]).toString();
        texts.push(text);
        // "page N of M" once on every page, with the right N and M (poppler reads the margin box).
        expect(text.match(/page (\d+) of (\d+)/g), `page ${n}`).toEqual([`page ${n} of ${pages}`]);
        const lines = text.split('\n').filter((l) => l.trim() && !/page \d+ of \d+/.test(l));
        lineCounts.push(lines.length);
        // A heading is never the last line of a page: what follows it is on the same page.
        // In -layout mode a line holds side-by-side columns, split by runs of spaces.
        const cells = lines
          .at(-1)!
          .split(/\s{2,}/)
          .map((c) => c.trim());
        for (const h of heads) expect(cells, `page ${n} ends with “${h}”`).not.toContain(h);
      }
      const all = texts.join('\n').replace(/\s+/g, ' ');
      for (const h of heads) expect(all, `heading “${h}” printed`).toContain(h);

      // No page but the last under a third full: by the lowest text on it (pdftotext -bbox) and by
      // its text lines against the fullest page.
      const ext = pageExtents(`${base}.pdf`);
      const fullest = Math.max(...lineCounts);
      ext.slice(0, -1).forEach((e, i) => {
        expect(e.bottom / e.height, `page ${i + 1} reaches down the page`).toBeGreaterThan(1 / 3);
        expect(lineCounts[i], `page ${i + 1} lines`).toBeGreaterThanOrEqual(fullest / 3);
      });

      // The zone with its corners and the site nearest to it.
      expect(all).toMatch(/Dyke road 4 s\d\d: [\d.]+ m/);
      // The hazard corners: as many numbered lat, lon pairs as the stated count, with the tolerance.
      const tol = /Outline simplified to within (\d+) m; (\d+) corners/.exec(all);
      expect(tol).not.toBeNull();
      const corners = all.match(/\b\d+\. 47\.\d{6}, 21\.\d{6}/g) ?? [];
      expect(corners.length).toBe(Number(tol![2]));
      expect(Number(tol![2])).toBeLessThanOrEqual(60);
      // The caution stays on the page.
      expect(all).toContain('airspace authorisation');
    }, 600_000);
  }
});
