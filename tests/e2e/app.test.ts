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

describe('the built app in Chromium', () => {
  it('plans the demo drop on first start and shows every site with the caution', async () => {
    const page = await browser.newPage({ viewport: { width: 1280, height: 800 } });
    const errors = watchErrors(page);
    await page.goto(inject('baseUrl'));
    await page.locator('seedfall-app tr[data-site]').first().waitFor();
    expect(await page.locator('seedfall-app tr[data-site]').count()).toBe(12);
    await expect(page.locator('seedfall-app [role=note]').textContent()).resolves.toContain(
      'airspace authorisation',
    );
    await shot(page, 'start');
    expect(errors).toEqual([]);
    await page.close();
  });
});
