import { mkdirSync } from 'node:fs';
import { chromium, type Browser, type Page } from 'playwright-core';
import { CHROMIUM_ARGS, CHROMIUM_PATH } from '../../app/print-pdf';

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
