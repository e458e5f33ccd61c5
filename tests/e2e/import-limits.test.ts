import { mkdtempSync, writeFileSync } from 'node:fs';
import { tmpdir } from 'node:os';
import { join } from 'node:path';
import type { Browser } from 'playwright-core';
import { afterAll, beforeAll, describe, expect, inject, it } from 'vitest';
import demo from '../../data/demo-plan.json';
import { schemaMaxItems } from '../../app/formats/import-limits';
import { launch, openApp, shot } from './browser';

let browser: Browser;
beforeAll(async () => {
  browser = await launch();
});
afterAll(async () => {
  await browser?.close();
});

const g = (n: number) => n.toLocaleString('en-US');

describe('imports stop at the plan’s limits in Chromium', () => {
  it('a 20,000-row sites CSV adds only what the plan holds, says so, and the plan stays valid', async () => {
    const { context, page, errors } = await openApp(browser, inject('baseUrl'));
    // 20,000 invented sites within 10 km of the demo release point (well over the 200 kB that
    // sends a file to the import worker).
    const { lat, lon } = demo.release;
    const rows = ['id,name,lat,lon'];
    for (let i = 0; i < 20_000; i++) {
      const a = (i * 137.508 * Math.PI) / 180;
      const r = 0.05 * Math.sqrt((i + 1) / 20_000);
      rows.push(
        `x${i},Site ${i},${(lat + r * Math.sin(a)).toFixed(6)},${(lon + r * Math.cos(a)).toFixed(6)}`,
      );
    }
    const file = join(mkdtempSync(join(tmpdir(), 'sf-import-')), 'many-sites.csv');
    writeFileSync(file, rows.join('\n'));
    const max = schemaMaxItems('sites');
    const room = max - demo.sites.length;
    await page.locator('[data-tab=sites]').click();
    const notice = page.locator('[data-testid=notice]');
    await page.locator('input[data-testid=import-sites]').setInputFiles(file);
    await expect
      .poll(() => notice.innerText(), { timeout: 60_000 })
      .toContain(
        `many-sites.csv: ${g(room)} site(s) added; only the first ${g(room)} sites were read (the plan holds at most ${g(max)}, ${g(demo.sites.length)} already in it)`,
      );
    // Read at once, before the app starts on the 1,000-site plan's result.
    expect(await page.locator('sf-sites-panel h3').first().textContent()).toBe(
      `Sensor sites (${max})`,
    );
    // The plan is valid: no problem count in the status line.
    expect(await page.locator('[data-testid=stale]').count()).toBe(0);
    // No screenshot here: the app is now planning 1,000 sites (large-plan.test.ts covers how
    // such a plan is shown). The import itself ran in the worker and left the page answering.
    expect(errors).toEqual([]);
    await context.close();
  });

  it('a winds-aloft group over the plan’s limits is left out and the notice says not all was used', async () => {
    const { context, page, errors } = await openApp(browser, inject('baseUrl'));
    await page.locator('[data-tab=winds]').click();
    // Invented bulletin; 7799 codes 270° at 199 kt (102.4 m/s), +99 is 99 °C.
    await page
      .locator('[data-testid=bulletin]')
      .fill('FT  3000    6000    9000\nQXV 2714 7799+05 2725+99');
    await page.getByRole('button', { name: 'Decode' }).click();
    await page.getByRole('button', { name: /Use this station/ }).click();
    const notice = page.locator('[data-testid=notice]');
    await expect
      .poll(() => notice.innerText())
      .toMatch(
        /^Winds aloft QXV: 2 wind layer\(s\) and 1 temperature\(s\) in use\. 2 value\(s\) were not used/,
      );
    const problems = page.locator('sf-wind-sources .problems');
    await expect(problems.innerText()).resolves.toMatch(
      /line 2: QXV 6000 ft: speed_mps 102\.3744 is outside the plan's range/,
    );
    await expect(problems.innerText()).resolves.toMatch(
      /line 2: QXV 9000 ft: temperature_K 372\.15 is outside the plan's range/,
    );
    expect(await page.locator('[data-testid=stale]').count()).toBe(0);
    await problems.scrollIntoViewIfNeeded();
    await shot(page, 'import-limits-winds');
    expect(errors).toEqual([]);
    await context.close();
  });
});
