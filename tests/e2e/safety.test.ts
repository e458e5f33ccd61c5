import type { Browser, BrowserContext, Page } from 'playwright-core';
import { afterAll, afterEach, beforeAll, describe, expect, inject, it } from 'vitest';
import { launch, openApp, shot } from './browser';

let browser: Browser;
let context: BrowserContext;
let page: Page;
let errors: string[];

beforeAll(async () => {
  browser = await launch();
});
afterAll(async () => {
  await browser?.close();
});
afterEach(async () => {
  await context?.close();
});

async function open(): Promise<void> {
  ({ context, page, errors } = await openApp(browser, inject('baseUrl')));
  await page.locator('[data-tab=safety]').click();
  await page.locator('sf-safety-panel [data-check]').first().waitFor();
}

const status = (id: string) =>
  page.locator(`sf-safety-panel [data-check=${id}]`).getAttribute('data-status');

describe('the safety panel in Chromium', () => {
  it('shows every automatic check and the hazard area on the map', async () => {
    await open();
    expect(await page.locator('sf-safety-panel [data-check]').count()).toBe(9);
    // The demo plan has sites below the required P(hit): that check fails, so it is not ready.
    expect(await status('p-hit')).toBe('fail');
    expect(await status('no-drop-zones')).toBe('pass');
    await expect(page.locator('[data-testid=safety-state]').innerText()).resolves.toContain(
      'NOT READY',
    );
    expect(await page.locator('sf-map path.sf-hazard').count()).toBeGreaterThanOrEqual(1);
    expect(await page.locator('sf-map path.sf-nodrop').count()).toBe(1);
    await shot(page, 'safety-panel');
    expect(errors).toEqual([]);
  });

  it('keeps ticked crew items, with who and when, across a reload', async () => {
    await open();
    const item = page.locator('sf-safety-panel [data-item=airspace]');
    await item.locator('input[placeholder=who]').fill('R. Okafor');
    await item.locator('input[placeholder=who]').press('Enter');
    await item.locator('select').selectOption('done');
    await expect(item.locator('.meta .muted').innerText()).resolves.toMatch(
      /^\d{4}-\d\d-\d\dT\d\d:\d\d$/,
    );
    await page.waitForTimeout(400);
    await page.reload();
    await page.locator('[data-testid=planned]').waitFor({ timeout: 30_000 });
    await page.locator('[data-tab=safety]').click();
    const again = page.locator('sf-safety-panel [data-item=airspace]');
    await expect(again.locator('select').inputValue()).resolves.toBe('done');
    await expect(again.locator('input[placeholder=who]').inputValue()).resolves.toBe('R. Okafor');
    expect(errors).toEqual([]);
  });

  it('will not mark ready with a failing check unless a reason is written, then records it', async () => {
    await open();
    for (const id of await page
      .locator('sf-safety-panel [data-item]')
      .evaluateAll((els) => els.map((e) => e.getAttribute('data-item')))) {
      await page.locator(`sf-safety-panel [data-item="${id}"] select`).selectOption('done');
    }
    await page.locator('[data-testid=planned]').waitFor({ timeout: 30_000 });
    await page.locator('[data-testid=signer]').fill('M. Varga');
    await page.getByRole('button', { name: 'Mark ready' }).click();
    await expect(
      page.locator('sf-safety-panel .signoff [role=alert]').innerText(),
    ).resolves.toContain('write the reason');
    await page
      .locator('[data-testid=override-reason]')
      .fill('Sites s07, s11, s12 are best-effort.');
    await page.getByRole('button', { name: 'Mark ready' }).click();
    await page.locator('[data-testid=planned]').waitFor({ timeout: 30_000 });
    await expect
      .poll(() => page.locator('[data-testid=safety-state]').innerText(), { timeout: 15_000 })
      .toContain('READY — signed off by M. Varga');
    await expect(page.locator('[data-testid=safety-state]').innerText()).resolves.toContain(
      'best-effort',
    );
    expect(errors).toEqual([]);
  });

  it('draws a no-drop zone on the map and checks the ellipses against it', async () => {
    await open();
    await page.getByRole('button', { name: 'Draw no-drop zone' }).click();
    // A triangle around site s10 (its corners clear of the site markers, which take clicks).
    const site = (await page.locator('sf-map .sf-site[data-site=s10]').boundingBox())!;
    const x = site.x + site.width / 2;
    const y = site.y + site.height / 2;
    for (const [dx, dy] of [
      [-30, -30],
      [30, -30],
      [0, 30],
    ]) {
      await page.mouse.click(x + dx, y + dy);
    }
    await shot(page, 'safety-drawing');
    await page.getByRole('button', { name: /Finish zone/ }).click();
    await expect.poll(() => page.locator('sf-map path.sf-nodrop').count()).toBe(2);
    await page.locator('[data-testid=planned]').waitFor({ timeout: 30_000 });
    await expect.poll(() => status('no-drop-zones'), { timeout: 15_000 }).toBe('fail');
    await shot(page, 'safety-drawn-zone');
    expect(errors).toEqual([]);
  });
});
