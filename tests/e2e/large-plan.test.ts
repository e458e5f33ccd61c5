import type { Browser } from 'playwright-core';
import { afterAll, beforeAll, describe, expect, inject, it } from 'vitest';
import { makeField } from '../support/make-field';
import { launch, shot, watchErrors } from './browser';

const DRAFT_KEY = 'seedfall.draft.v1';
/** The schema's limit on sites (plan.schema.json, sites.maxItems). */
const SITES = 1000;

let browser: Browser;
beforeAll(async () => {
  browser = await launch();
});
afterAll(async () => {
  await browser?.close();
});

describe('a plan with as many sites as a plan holds, in Chromium', () => {
  // No time is asserted (speed belongs in the bench); the waits are sized for a slow shared
  // machine. What is checked is that the result is shown at all and the page still answers.
  it('shows the result of a 1,000-site plan in the table and on the map, and the tabs still answer', async () => {
    const context = await browser.newContext({ viewport: { width: 1280, height: 800 } });
    try {
      await context.addInitScript(
        ([key, text]) => {
          if (localStorage.getItem('e2e.seeded') === null) {
            localStorage.setItem('e2e.seeded', '1');
            localStorage.setItem(key, text);
          }
          const w = window as unknown as { longTasks: number[] };
          w.longTasks = [];
          new PerformanceObserver((list) => {
            for (const e of list.getEntries()) w.longTasks.push(e.duration);
          }).observe({ type: 'longtask', buffered: true });
        },
        [DRAFT_KEY, JSON.stringify(makeField(SITES))] as const,
      );
      const page = await context.newPage();
      const errors = watchErrors(page);
      await page.goto(inject('baseUrl'));
      const planned = page.locator('[data-testid=planned]');
      await planned.waitFor({ timeout: 180_000 });
      expect(await planned.innerText()).toMatch(/^Planned 1000 sites in \d+ ms\.$/);

      // The results table lists every site, once.
      const rows = page.locator('sf-results-table tbody tr');
      expect(await rows.count()).toBe(SITES);
      const ids = await rows.evaluateAll((trs) => trs.map((tr) => tr.getAttribute('data-site')));
      expect(new Set(ids).size).toBe(SITES);

      // The map draws every site; the result shapes go on a canvas (map.test.ts checks it and
      // the thinned labels), so no SVG element is drawn per shape.
      expect(await page.locator('sf-map .sf-site').count()).toBe(SITES);
      expect(await page.locator('sf-map .leaflet-overlay-pane canvas').count()).toBeGreaterThan(0);
      expect(await page.locator('sf-map path.sf-ellipse95').count()).toBe(0);
      // A row click shows the site on the map with its tooltip (built when it opens), which
      // names the site and its result.
      await page.locator('sf-results-table tr[data-site=f0001]').click();
      await expect
        .poll(() => page.locator('sf-map .leaflet-tooltip').last().innerText())
        .toMatch(/^Site f0001 · Field site 1 — \S+, P\(hit\) \d\.\d\d ± (<)?\d\.\d\d, CEP /);

      // A tab click still gets an answer: the panel renders and the page runs a script.
      await page.locator('[data-tab=safety]').click();
      await page.locator('sf-safety-panel h3').first().waitFor({ timeout: 60_000 });
      expect(await page.evaluate(() => document.title.length >= 0)).toBe(true);
      await page.locator('[data-tab=results]').click();
      await rows.first().waitFor({ timeout: 60_000 });

      const longest = await page.evaluate(() =>
        Math.max(0, ...(window as unknown as { longTasks: number[] }).longTasks),
      );
      console.log(`large-plan: longest main-thread task ${Math.round(longest)} ms`);
      await shot(page, 'large-plan-1000');
      expect(errors).toEqual([]);
    } finally {
      await context.close();
    }
  }, 420_000);
});
