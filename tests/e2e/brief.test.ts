import { execFileSync } from 'node:child_process';
import { mkdirSync } from 'node:fs';
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
