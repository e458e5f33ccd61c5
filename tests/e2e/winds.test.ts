import type { Browser } from 'playwright-core';
import { afterAll, beforeAll, describe, expect, inject, it } from 'vitest';
import { launch, shot, watchErrors } from './browser';

let browser: Browser;
beforeAll(async () => {
  browser = await launch();
});
afterAll(async () => {
  await browser?.close();
});

// An invented bulletin in the open winds-aloft text layout (levels in ft MSL; groups DDffTT).
const BULLETIN = [
  'WINDS ALOFT FORECAST - INVENTED EXAMPLE FOR TESTS',
  'FT  3000    6000    9000   12000   18000   24000  30000  34000  39000',
  'VRX 2410 2515+06 2622+01 2730-04 2842-16 2955-28 306642 317451 318057',
  'KLW 9900 2208+04 2414-01 2521-06 2633-18 2745-30 285644 296552 297158',
].join('\n');

describe('wind inputs in Chromium', () => {
  it('decodes a pasted bulletin into the wind layers and redraws the profile plot', async () => {
    const context = await browser.newContext({ viewport: { width: 1280, height: 900 } });
    const page = await context.newPage();
    const errors = watchErrors(page);
    await page.goto(inject('baseUrl'));
    await page.locator('[data-testid=planned]').waitFor({ timeout: 30_000 });
    await page.locator('[data-tab=winds]').click();
    const plotBefore = await page.locator('[data-testid=wind-plot] path.sp').getAttribute('d');
    expect(await page.locator('sf-wind-panel tr[data-layer]').count()).toBe(6);
    await page.locator('[data-testid=bulletin]').fill(BULLETIN);
    await page.getByRole('button', { name: 'Decode' }).click();
    await page.locator('[data-testid=station]').selectOption('VRX');
    await page.getByRole('button', { name: /Use this station/ }).click();
    // 3000 … 39000 ft: nine levels above the plan's 89 m ground.
    await expect.poll(() => page.locator('sf-wind-panel tr[data-layer]').count()).toBe(9);
    await expect(
      page.locator('sf-wind-panel select[data-path="winds.reference"]').inputValue(),
    ).resolves.toBe('MSL');
    // 3000 ft = 914.4 m (international foot); 2410 = from 240° at 10 kt = 5.14444 m/s.
    await expect(
      page.locator('sf-wind-panel input[data-path="winds.layers[0].altitude_m"]').inputValue(),
    ).resolves.toBe('914.4');
    await expect(
      page.locator('sf-wind-panel input[data-path="winds.layers[0].speed_mps"]').inputValue(),
    ).resolves.toBe('5.14444');
    await page.locator('[data-testid=planned]').waitFor({ timeout: 30_000 });
    await expect
      .poll(() => page.locator('[data-testid=wind-plot] path.sp').getAttribute('d'))
      .not.toBe(plotBefore);
    await shot(page, 'winds-bulletin');
    // The hodograph is drawn, and the altitude sweep runs in its own worker.
    expect(await page.locator('[data-testid=hodograph] svg').count()).toBe(1);
    await page.getByRole('button', { name: 'Compute' }).click();
    await page.locator('[data-testid=sweep] svg').waitFor({ timeout: 30_000 });
    expect(await page.locator('[data-testid=sweep] svg circle').count()).toBeGreaterThanOrEqual(9);
    await page.locator('[data-testid=sweep]').scrollIntoViewIfNeeded();
    await shot(page, 'winds-sweep');
    // The demo plan holds a second forecast 3.5 h later: the timeline covers both, per site.
    await page.getByRole('button', { name: 'Timeline' }).click();
    await page.locator('[data-testid=timeline] svg').waitFor({ timeout: 60_000 });
    const cells = await page.locator('[data-testid=timeline] svg rect').count();
    expect(cells).toBeGreaterThanOrEqual(12 * 10);
    expect(await page.locator('[data-testid=timeline] svg rect.ok').count()).toBeGreaterThan(0);
    await page.locator('[data-testid=timeline]').scrollIntoViewIfNeeded();
    await shot(page, 'winds-timeline');
    // One undo brings the previous profile back.
    await page.getByRole('button', { name: 'Undo' }).click();
    await expect.poll(() => page.locator('sf-wind-panel tr[data-layer]').count()).toBe(6);
    expect(errors).toEqual([]);
    await context.close();
  });
});
