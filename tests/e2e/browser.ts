import { mkdirSync } from 'node:fs';
import { chromium, type Browser, type BrowserContext, type Page } from 'playwright-core';
import { CHROMIUM_ARGS, CHROMIUM_PATH } from '../../app/cli/print-pdf';

/** Debian's Chromium, started as the probe on these machines starts it (see DEVELOPERS.md). */
export async function launch(): Promise<Browser> {
  return chromium.launch({
    executablePath: CHROMIUM_PATH,
    args: CHROMIUM_ARGS,
  });
}

/** Collects console errors and page errors of a page. */
export function watchErrors(page: Page): string[] {
  const errors: string[] = [];
  page.on('console', (m) => {
    if (m.type() === 'error') errors.push(m.text());
  });
  page.on('pageerror', (e) => errors.push(String(e)));
  return errors;
}

/** Saves a screenshot under test-output/ (git-ignored) for a person to look at. */
export async function shot(page: Page, name: string): Promise<void> {
  mkdirSync('test-output', { recursive: true });
  await page.screenshot({ path: `test-output/${name}.png` });
}

/**
 * A fresh browser profile (empty storage) on the app, with long tasks recorded in
 * `window.longTasks`, once the first planning result is shown.
 */
export async function openApp(
  browser: Browser,
  baseUrl: string,
  viewport = { width: 1280, height: 800 },
): Promise<{ context: BrowserContext; page: Page; errors: string[] }> {
  const context = await browser.newContext({ viewport });
  await context.addInitScript(() => {
    const w = window as unknown as { longTasks: number[] };
    w.longTasks = [];
    new PerformanceObserver((list) => {
      for (const e of list.getEntries()) w.longTasks.push(e.duration);
    }).observe({ type: 'longtask', buffered: true });
  });
  const page = await context.newPage();
  const errors = watchErrors(page);
  await page.goto(baseUrl);
  await page.locator('[data-testid=planned]').waitFor({ timeout: 30_000 });
  return { context, page, errors };
}
