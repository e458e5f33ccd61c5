// Installable and offline: after one visit the service worker (vite.config.ts) serves the whole
// app, so with the network gone a reload still starts, plans, sweeps and prints; the web manifest
// and its icons make it installable; a new version waits for the person's click.
import { execFileSync } from 'node:child_process';
import { mkdirSync, readFileSync, writeFileSync } from 'node:fs';
import { join } from 'node:path';
import type { Browser, BrowserContext, Page } from 'playwright-core';
import { afterAll, afterEach, beforeAll, describe, expect, inject, it } from 'vitest';
import { launch, shot, watchErrors } from './browser';

let browser: Browser;
let context: BrowserContext | undefined;
beforeAll(async () => {
  browser = await launch();
});
afterEach(async () => {
  await context?.close();
  context = undefined;
});
afterAll(async () => {
  await browser?.close();
});

// Installing caches every file of the app (several MB) while the first plan runs: generous.
const INSTALL_MS = 90_000;

/** A fresh profile on the app, recording Content-Security-Policy violations, first plan shown. */
async function firstVisit(): Promise<{ page: Page; errors: string[] }> {
  context = await browser.newContext({ viewport: { width: 1280, height: 800 } });
  await context.addInitScript(() => {
    const w = window as unknown as { cspViolations: string[] };
    w.cspViolations = [];
    window.addEventListener(
      'securitypolicyviolation',
      (e) => w.cspViolations.push(`${e.effectiveDirective} ${e.blockedURI} ${e.sourceFile}`),
      true,
    );
  });
  const page = await context.newPage();
  const errors = watchErrors(page);
  await page.goto(inject('baseUrl'));
  await page.locator('[data-testid=planned]').waitFor({ timeout: 60_000 });
  return { page, errors };
}

/** The state of the service worker that serves this page's scope ('' while there is none). */
const workerState = (page: Page): Promise<string> =>
  page.evaluate(async () => {
    const r = await navigator.serviceWorker.getRegistration();
    return r?.active?.state ?? '';
  });

const cspViolations = (page: Page): Promise<string[]> =>
  page.evaluate(() => (window as unknown as { cspViolations: string[] }).cspViolations);

describe('the app offline after one visit', () => {
  it('starts, plans the demo, sweeps the altitudes and prints the brief with the network gone', async () => {
    const { page, errors } = await firstVisit();
    const baseUrl = inject('baseUrl');
    await expect.poll(() => workerState(page), { timeout: INSTALL_MS }).toBe('activated');
    // The worker's scope is the folder the app is served from (base './').
    const scope = await page.evaluate(async () => {
      const r = await navigator.serviceWorker.getRegistration();
      return r?.scope ?? '';
    });
    expect(scope).toBe(new URL('./', baseUrl).href);

    await context!.setOffline(true);
    // The server is truly out of reach for the page now (a fetch past the worker fails); the
    // browser's console report of that one failed request is not the app's error.
    const before = errors.length;
    await expect(
      page.evaluate(() =>
        fetch(`./not-cached-${Date.now()}.txt`, { cache: 'no-store' }).then(
          () => 'reached',
          () => 'failed',
        ),
      ),
    ).resolves.toBe('failed');
    errors.splice(before);
    await page.reload();
    await page.locator('[data-testid=planned]').waitFor({ timeout: 60_000 });
    await expect(page.evaluate(() => navigator.serviceWorker.controller !== null)).resolves.toBe(
      true,
    );
    // The demo plan's results table is filled (data/demo-plan.json has 12 sites).
    await expect
      .poll(() => page.locator('sf-results-table tbody tr').count(), { timeout: 30_000 })
      .toBe(12);
    await shot(page, 'offline-planned');

    // The altitude sweep's worker comes from the cache too.
    await page.locator('[data-tab=winds]').click();
    await page
      .locator('sf-wind-sources')
      .getByRole('button', { name: /^Comput/ })
      .click();
    await page.locator('[data-testid=sweep] svg').waitFor({ timeout: 60_000 });
    expect(await page.locator('[data-testid=sweep] svg circle').count()).toBeGreaterThanOrEqual(9);
    expect(await page.locator('[data-testid=sweep-error]').count()).toBe(0);
    await page.locator('[data-testid=sweep]').scrollIntoViewIfNeeded();
    await shot(page, 'offline-sweep');

    // The brief opens (a blob: tab of this page) and prints.
    const [brief] = await Promise.all([
      context!.waitForEvent('page'),
      page.getByRole('button', { name: 'Brief' }).click(),
    ]);
    await brief.waitForLoadState('load');
    await expect(brief.locator('h1').innerText()).resolves.toContain('Drop brief');
    expect(await brief.locator('[data-action=print]').count()).toBe(1);
    mkdirSync('test-output/offline', { recursive: true });
    const pdf = 'test-output/offline/brief.pdf';
    await brief.pdf({ path: pdf, format: 'A4', printBackground: true, preferCSSPageSize: true });
    const text = execFileSync('pdftotext', ['-layout', '-f', '1', '-l', '1', pdf, '-']).toString();
    expect(text).toContain('Drop brief');
    await shot(brief, 'offline-brief');

    expect(await cspViolations(page)).toEqual([]);
    expect(errors).toEqual([]);
  });
});

describe('installing the app', () => {
  it('links a web manifest with our name, a standalone display and icons that load', async () => {
    const { page, errors } = await firstVisit();
    const href = await page.locator('link[rel=manifest]').getAttribute('href');
    expect(href).toBeTruthy();
    const manifestUrl = new URL(href!, page.url()).href;
    const manifest = (await page.evaluate((u) => fetch(u).then((r) => r.json()), manifestUrl)) as {
      name: string;
      short_name: string;
      description: string;
      start_url: string;
      display: string;
      theme_color: string;
      background_color: string;
      icons: { src: string; sizes: string; type: string; purpose?: string }[];
    };
    expect(manifest.name).toMatch(/^Seedfall/);
    expect(manifest.short_name).toBe('Seedfall');
    expect(manifest.description.length).toBeGreaterThan(20);
    expect(new URL(manifest.start_url, manifestUrl).href).toBe(new URL('./', page.url()).href);
    expect(manifest.display).toBe('standalone');
    // The header's colour (app/ui/seedfall-app.ts) and the page's white.
    expect(manifest.theme_color).toBe('#1f3a34');
    expect(manifest.background_color).toBe('#ffffff');
    // Installability in Chromium asks for a 192 px and a 512 px icon; Android masks a maskable one.
    // // common practice
    const pngs = manifest.icons.filter((i) => i.type === 'image/png');
    expect(pngs.map((i) => i.sizes)).toEqual(expect.arrayContaining(['192x192', '512x512']));
    expect(manifest.icons.some((i) => i.purpose === 'maskable')).toBe(true);
    for (const icon of pngs) {
      const size = await page.evaluate(async (u) => {
        const img = new Image();
        img.src = u;
        await img.decode();
        return `${img.naturalWidth}x${img.naturalHeight}`;
      }, new URL(icon.src, manifestUrl).href);
      expect(size, icon.src).toBe(icon.sizes);
    }

    // Once the worker is active, the next load is controlled by it.
    await expect.poll(() => workerState(page), { timeout: INSTALL_MS }).toBe('activated');
    await page.reload();
    await page.locator('[data-testid=planned]').waitFor({ timeout: 60_000 });
    await expect
      .poll(() => page.evaluate(() => navigator.serviceWorker.controller?.state ?? ''), {
        timeout: 30_000,
      })
      .toBe('activated');
    expect(await page.locator('[data-testid=app-update]').count()).toBe(0);
    expect(await cspViolations(page)).toEqual([]);
    expect(errors).toEqual([]);
  });
});

describe('a new version of the app', () => {
  it('waits for the person’s click on Reload in the status line, then takes over', async () => {
    const { page, errors } = await firstVisit();
    await expect.poll(() => workerState(page), { timeout: INSTALL_MS }).toBe('activated');
    await page.reload();
    await page.locator('[data-testid=planned]').waitFor({ timeout: 60_000 });
    // A mark that a reload would wipe.
    await page.evaluate(() => ((window as unknown as { notReloaded: boolean }).notReloaded = true));
    const notReloaded = () =>
      page.evaluate(() => (window as unknown as { notReloaded?: boolean }).notReloaded === true);

    // The server now has a new version: the same worker script with one line more (the preview
    // server reads its folder on every request; the script is put back at the end for the other
    // tests).
    const swFile = join(inject('outDir'), 'sw.js');
    const original = readFileSync(swFile, 'utf8');
    try {
      writeFileSync(swFile, `${original}\n// a new version\n`);
      await page.evaluate(async () => {
        const r = await navigator.serviceWorker.getRegistration();
        await r?.update();
      });
      await expect
        .poll(
          () =>
            page.evaluate(
              async () => (await navigator.serviceWorker.getRegistration())?.waiting?.state ?? '',
            ),
          { timeout: INSTALL_MS },
        )
        .toBe('installed');
      const notice = page.locator('[data-testid=app-update]');
      await notice.waitFor({ timeout: INSTALL_MS });
      await expect(notice.innerText()).resolves.toMatch(/A new version is ready — +Reload/);
      await shot(page, 'offline-update-notice');
      // It waits: the page was not reloaded, and the new worker is installed but not in charge.
      await expect(notReloaded()).resolves.toBe(true);
      await expect(
        page.evaluate(
          async () => (await navigator.serviceWorker.getRegistration())?.waiting?.state,
        ),
      ).resolves.toBe('installed');

      await notice.getByRole('button', { name: 'Reload' }).click();
      await expect.poll(() => notReloaded().catch(() => true), { timeout: 60_000 }).toBe(false);
      await page.locator('[data-testid=planned]').waitFor({ timeout: 60_000 });
      await expect
        .poll(
          () =>
            page.evaluate(async () => {
              const r = await navigator.serviceWorker.getRegistration();
              return `${r?.waiting ? 'waiting' : 'none'} ${navigator.serviceWorker.controller?.state}`;
            }),
          { timeout: 30_000 },
        )
        .toBe('none activated');
      expect(await notice.count()).toBe(0);
      expect(await cspViolations(page)).toEqual([]);
      expect(errors).toEqual([]);
    } finally {
      writeFileSync(swFile, original);
    }
  });
});
