import { mkdtempSync, writeFileSync } from 'node:fs';
import { tmpdir } from 'node:os';
import { join } from 'node:path';
import type { Browser, BrowserContext, Page } from 'playwright-core';
import { afterAll, afterEach, beforeAll, describe, expect, inject, it } from 'vitest';
import demo from '../../data/demo-plan.json';
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

const details = () => page.locator('sf-site-details [data-testid=site-details]');
const row = (id: string) => page.locator(`sf-results-table tr[data-site="${id}"]`);
/** P(hit) as the table and the details print it: "0.91 ± 0.01" or "1.00 ± <0.01". */
const P_HIT_SE = /^(0|1)\.\d\d ± (<0\.01|0\.\d\d)$/;

/** The element holding focus, looked for through shadow roots: tag and data-site / text. */
function focused(p: Page): Promise<string> {
  return p.evaluate(() => {
    let a: Element | null = document.activeElement;
    while (a?.shadowRoot?.activeElement) a = a.shadowRoot.activeElement;
    if (!a) return '';
    return `${a.localName}${a.getAttribute('data-site') ? `[${a.getAttribute('data-site')}]` : ''}`;
  });
}

async function open(): Promise<void> {
  ({ context, page, errors } = await openApp(browser, inject('baseUrl')));
}

/** Opens a plan file as a person would (the Open button's file input) and waits for its rows. */
async function openPlan(plan: unknown, waitForSite: string): Promise<void> {
  const dir = mkdtempSync(join(tmpdir(), 'seedfall-details-'));
  const file = join(dir, 'plan.json');
  writeFileSync(file, JSON.stringify(plan));
  await page.locator('input[data-testid=open-file]').setInputFiles(file);
  await expect.poll(() => row(waitForSite).count(), { timeout: 60_000, interval: 250 }).toBe(1);
  await page.locator('[data-testid=planned]').waitFor({ timeout: 60_000 });
}

describe('the site details view in Chromium', () => {
  it('opens from a row with every variant side by side, the chosen one marked with why, the scatter and the fall', async () => {
    await open();
    expect(await details().count()).toBe(0);
    const tableVariant = (await row('s01').locator('[data-col=variant]').innerText()).trim();
    const tablePHit = (await row('s01').locator('[data-col=phit]').innerText()).trim();
    await row('s01').click();
    await details().waitFor({ timeout: 30_000 });
    // Focus moves into the view (its heading) so a keyboard user is where the content is.
    await expect.poll(() => focused(page), { timeout: 10_000 }).toBe('h2');
    await expect(details().locator('h2').innerText()).resolves.toContain('s01');

    // Every variant of the plan, in catalogue order, as a column (data/demo-plan.json).
    const cols = await details()
      .locator('thead th[data-variant]')
      .evaluateAll((els) => els.map((e) => e.getAttribute('data-variant')));
    expect(cols).toEqual(demo.variants.map((v) => v.id));
    const cells = (key: string) =>
      details()
        .locator(`tr[data-row=${key}] td`)
        .evaluateAll((els) => els.map((e) => (e as HTMLElement).innerText.trim()));
    for (const t of await cells('phit')) expect(t).toMatch(P_HIT_SE);
    for (const t of await cells('energy')) expect(t).toMatch(/^(\d+\.\d\d J|mass unknown)/);
    expect(await cells('cost')).toEqual(demo.variants.map((v) => String(v.cost)));
    for (const key of ['reach', 'cep', 'window', 'heading', 'thrust'])
      expect((await cells(key)).length).toBe(3);

    // The chosen variant is the one the table names, with the same P(hit) the table shows.
    const marks = details().locator('[data-testid=chosen-mark]');
    expect(await marks.count()).toBe(1);
    const chosen = await details().locator('thead th.chosen').getAttribute('data-variant');
    expect(chosen).toBe(tableVariant);
    const chosenPHit = await details()
      .locator(`tr[data-row=phit] td[data-variant="${chosen}"]`)
      .innerText();
    expect(chosenPHit.trim()).toBe(tablePHit);
    await expect(details().locator('[data-testid=why]').innerText()).resolves.toMatch(
      /P\(hit\) ≥ 0\.90|highest/,
    );

    // The landing scatter of the chosen variant: its samples, both ellipses, the tolerance.
    const scatter = details().locator('[data-testid=scatter] svg');
    expect(await scatter.locator('circle.pt').count()).toBe(demo.monteCarlo.samples);
    expect(await scatter.locator('ellipse.e50').count()).toBe(1);
    expect(await scatter.locator('ellipse.e95').count()).toBe(1);
    expect(await scatter.locator('circle.tol').count()).toBe(1);
    const profile = details().locator('[data-testid=fall-profile] svg');
    expect(await profile.locator('polyline').count()).toBe(2);
    await shot(page, 'site-details-1280x800');
    await details().locator('[data-testid=fall-profile]').scrollIntoViewIfNeeded();
    await shot(page, 'site-details-plots-1280x800');

    // Another variant's landings on request.
    const other = demo.variants.map((v) => v.id).find((v) => v !== chosen)!;
    await details().locator('[data-testid=shown-variant]').selectOption(other);
    await expect
      .poll(() => scatter.locator('text').allTextContents(), { timeout: 30_000 })
      .toContainEqual(expect.stringContaining(`s01 · ${other}`));
    expect(await scatter.locator('circle.pt').count()).toBe(demo.monteCarlo.samples);

    // Escape closes it and focus goes back to the row it came from.
    await page.keyboard.press('Escape');
    await expect.poll(() => details().count(), { timeout: 10_000 }).toBe(0);
    await expect.poll(() => focused(page), { timeout: 10_000 }).toBe('tr[s01]');
    expect(errors).toEqual([]);
  });

  it('opens from the keyboard (Enter and Space on a row) and closes with its button', async () => {
    await open();
    await row('s02').focus();
    await page.keyboard.press('Enter');
    await details().waitFor({ timeout: 30_000 });
    await expect(details().getAttribute('data-site')).resolves.toBe('s02');
    await expect(row('s02').getAttribute('aria-selected')).resolves.toBe('true');
    await page.keyboard.press('Escape');
    await expect.poll(() => details().count(), { timeout: 10_000 }).toBe(0);

    await row('s03').focus();
    await page.keyboard.press(' ');
    await details().waitFor({ timeout: 30_000 });
    await expect(details().getAttribute('data-site')).resolves.toBe('s03');
    await details().getByRole('button', { name: 'Close site details' }).click();
    await expect.poll(() => details().count(), { timeout: 10_000 }).toBe(0);
    expect(errors).toEqual([]);
  });

  it('says so in the row and the view when no variant can reach a site', async () => {
    await open();
    // s05 moved 3 km across the 250° track (bearing 340°): no release along the track lands
    // within any variant's reach of it (flat-earth offset; 1° of latitude ≈ 111.32 km).
    const plan = structuredClone(demo);
    const s05 = plan.sites.find((s) => s.id === 's05')!;
    const b = (340 * Math.PI) / 180;
    s05.lat += (3000 * Math.cos(b)) / 111_320;
    s05.lon += (3000 * Math.sin(b)) / (111_320 * Math.cos((s05.lat * Math.PI) / 180));
    s05.name = 'Far Meadow';
    await openPlan(plan, 's05');
    await expect
      .poll(() => row('s05').locator('[data-col=variant]').innerText(), { timeout: 60_000 })
      .toBe('none can reach');
    await expect(row('s05').locator('[data-col=variant]').getAttribute('title')).resolves.toContain(
      'no variant can reach',
    );
    expect((await row('s05').locator('[data-col=phit]').innerText()).trim()).toMatch(P_HIT_SE);

    await row('s05').click();
    await details().waitFor({ timeout: 30_000 });
    await expect(details().locator('[data-testid=unreachable]').innerText()).resolves.toBe(
      'No variant can reach this site.',
    );
    expect(await details().locator('[data-testid=chosen-mark]').count()).toBe(0);
    for (const t of await details()
      .locator('tr[data-row=reach] td')
      .evaluateAll((els) => els.map((e) => (e as HTMLElement).innerText.trim())))
      expect(t).toBe('no');
    expect(await details().locator('[data-testid=scatter] svg circle.pt').count()).toBeGreaterThan(
      0,
    );
    await shot(page, 'site-details-unreachable-1280x800');
    expect(errors).toEqual([]);
  });
});
