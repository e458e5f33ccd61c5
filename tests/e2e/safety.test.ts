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

async function open(): Promise<void> {
  ({ context, page, errors } = await openApp(browser, inject('baseUrl')));
  await page.locator('[data-tab=safety]').click();
  await page.locator('sf-safety-panel [data-check]').first().waitFor();
}

const status = (id: string) =>
  page.locator(`sf-safety-panel [data-check=${id}]`).getAttribute('data-status');

/** Opens a plan file through the toolbar's Open…, as a person would. */
async function openPlan(plan: unknown): Promise<void> {
  const file = join(mkdtempSync(join(tmpdir(), 'seedfall-safety-')), 'plan.json');
  writeFileSync(file, JSON.stringify(plan));
  await page.locator('input[data-testid=open-file]').setInputFiles(file);
}

/** The site the app has selected, read from its store. */
const selectedSite = () =>
  page.evaluate(
    () =>
      (document.querySelector('seedfall-app') as unknown as { store: { selectedSite: string } })
        .store.selectedSite,
  );

/** How far (px) a site's marker lies from the middle of the map. */
async function offCentre(id: string): Promise<number> {
  const map = (await page.locator('sf-map').boundingBox())!;
  const m = await page.locator(`sf-map .sf-site[data-site="${id}"]`).boundingBox();
  if (!m) return Infinity;
  return Math.hypot(
    m.x + m.width / 2 - (map.x + map.width / 2),
    m.y + m.height / 2 - (map.y + map.height / 2),
  );
}

describe('the safety panel in Chromium', () => {
  it('shows every automatic check and the hazard area on the map', async () => {
    await open();
    expect(await page.locator('sf-safety-panel [data-check]').count()).toBe(11);
    // Planned without an elevation model: the carrier's terrain clearance is not applicable.
    expect(await status('terrain-clearance')).toBe('n/a');
    // The demo's layers span the fall: no wind-coverage warning, no warning line.
    expect(await status('wind-coverage')).toBe('pass');
    expect(await page.locator('[data-testid=plan-warnings]').count()).toBe(0);
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
    // Autosave has written the tick into the plan being edited (the plan library, IndexedDB)
    // before the page goes.
    const savedDraft = () =>
      page.evaluate(
        () =>
          new Promise<string>((resolve) => {
            const req = indexedDB.open('seedfall-library');
            req.onerror = () => resolve('');
            req.onsuccess = () => {
              const db = req.result;
              let text = '';
              const tx = db.transaction(['plans', 'meta']);
              const cur = tx.objectStore('meta').get('current');
              cur.onsuccess = () => {
                if (typeof cur.result !== 'string') return;
                const rec = tx.objectStore('plans').get(cur.result);
                rec.onsuccess = () => (text = (rec.result as { draft?: string })?.draft ?? '');
              };
              tx.oncomplete = () => {
                db.close();
                resolve(text);
              };
            };
          }),
      );
    await expect.poll(savedDraft, { timeout: 15_000 }).toMatch(/"state":"done","who":"R\. Okafor"/);
    await page.reload();
    await page.locator('[data-testid=planned]').waitFor({ timeout: 30_000 });
    await page.locator('[data-tab=safety]').click();
    const again = page.locator('sf-safety-panel [data-item=airspace]');
    await expect.poll(() => again.locator('select').inputValue(), { timeout: 30_000 }).toBe('done');
    await expect(again.locator('input[placeholder=who]').inputValue()).resolves.toBe('R. Okafor');
    expect(errors).toEqual([]);
  });

  it('will not mark ready with a failing check unless a reason is written, then records it', async () => {
    await open();
    // The name typed for the sign-off is who ticks the crew items.
    await page.locator('[data-testid=signer]').fill('M. Varga');
    for (const id of await page
      .locator('sf-safety-panel [data-item]')
      .evaluateAll((els) => els.map((e) => e.getAttribute('data-item')))) {
      await page.locator(`sf-safety-panel [data-item="${id}"] select`).selectOption('done');
    }
    await page.locator('[data-testid=planned]').waitFor({ timeout: 30_000 });
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

  it('names the sites of a failing check as buttons that select the site and show it on the map', async () => {
    await open();
    const check = page.locator('sf-safety-panel [data-check=p-hit]');
    const ids = await check
      .locator('.site-links button[data-site]')
      .evaluateAll((els) => els.map((e) => e.getAttribute('data-site')));
    // Every site below the required P(hit), as the results table marks them (its "!" rows).
    expect(ids.length).toBeGreaterThan(1);
    for (const id of ids) expect(await check.innerText()).toContain(id!);
    await expect(
      page.locator('sf-safety-panel [data-check=battery] .site-links button').allInnerTexts(),
    ).resolves.toEqual(['s12']);
    // Record the store's events as the page sees them.
    await page.evaluate(() => {
      const w = window as unknown as { seen: string[] };
      w.seen = [];
      const store = (document.querySelector('seedfall-app') as unknown as { store: EventTarget })
        .store;
      for (const type of ['select-site', 'focus-site'])
        store.addEventListener(type, (e) => w.seen.push(`${type}:${(e as CustomEvent).detail}`));
    });
    const target = ids[ids.length - 1]!;
    const before = await offCentre(target);
    await check.locator(`.site-links button[data-site="${target}"]`).click();
    await expect.poll(selectedSite, { timeout: 15_000 }).toBe(target);
    await expect
      .poll(() => page.evaluate(() => (window as unknown as { seen: string[] }).seen))
      .toEqual([`select-site:${target}`, `focus-site:${target}`]);
    // The map has moved the site to near its middle (the map may leave room for its own
    // controls, so not to the pixel); it was well off to one side before.
    expect(before).toBeGreaterThan(120);
    await expect.poll(() => offCentre(target), { timeout: 15_000 }).toBeLessThan(60);
    await expect(
      check.locator(`.site-links button[data-site="${target}"]`).getAttribute('aria-pressed'),
    ).resolves.toBe('true');
    await shot(page, 'safety-site-link');
    expect(errors).toEqual([]);
  });

  it('refuses to tick a crew item done without a name, then ticks it once a name is typed', async () => {
    await open();
    const item = page.locator('sf-safety-panel [data-item=landowner]');
    await item.locator('select').selectOption('done');
    const message = item.locator('.who-missing');
    await expect(message.innerText()).resolves.toMatch(/Not marked done: enter who checked/);
    expect(await message.isVisible()).toBe(true);
    await expect(item.locator('select').inputValue()).resolves.toBe('open');
    await expect
      .poll(() => page.locator('[data-testid=safety-state]').innerText())
      .toContain('open crew item: The landowner has agreed to the drops.');
    await shot(page, 'safety-crew-needs-name');
    // The tick was kept pending: naming who checked completes it.
    await item.locator('input[placeholder=who]').fill('J. Moreau');
    await item.locator('input[placeholder=who]').press('Enter');
    await expect.poll(() => item.locator('select').inputValue()).toBe('done');
    await expect(item.locator('.who-missing').count()).resolves.toBe(0);
    expect(errors).toEqual([]);
  });

  it('shows a done item with nobody named in an opened plan, and the sign-off refuses it', async () => {
    await open();
    const plan = structuredClone(demo) as Record<string, unknown> & {
      safety: Record<string, unknown>;
    };
    plan.safety = {
      ...plan.safety,
      checklist: [
        { id: 'airspace', text: 'Airspace authorisation in hand.', state: 'done', who: 'A. Ruiz' },
        { id: 'area-clear', text: 'Nobody inside the hazard area.', state: 'done' },
      ],
    };
    await openPlan(plan);
    const item = page.locator('sf-safety-panel [data-item=area-clear]');
    // Loaded as written: still "done", with the problem beside its "who".
    await expect.poll(() => item.locator('select').inputValue(), { timeout: 15_000 }).toBe('done');
    await expect(item.locator('.who-missing').innerText()).resolves.toContain('nobody is named');
    await expect
      .poll(() => page.locator('[data-testid=safety-state]').innerText(), { timeout: 30_000 })
      .toContain('crew item marked done with nobody named: Nobody inside the hazard area.');
    await page.locator('[data-testid=planned]').waitFor({ timeout: 30_000 });
    await page.locator('[data-testid=signer]').fill('M. Varga');
    await page.locator('[data-testid=override-reason]').fill('Best-effort sites.');
    await page.getByRole('button', { name: 'Mark ready' }).click();
    await expect(
      page.locator('sf-safety-panel .signoff [role=alert]').innerText(),
    ).resolves.toContain('marked done with nobody named (“Nobody inside the hazard area.”)');
    // The plan's own warning says so too, above every tab.
    await expect(page.locator('[data-testid=plan-warnings]').innerText()).resolves.toContain(
      'safety.checklist[1] is done but who is empty',
    );
    await shot(page, 'safety-crew-unnamed');
    expect(errors).toEqual([]);
  });

  it('warns on every tab, and in the checks, when the wind layers start far above the release', async () => {
    await open();
    // Layers as a winds-aloft bulletin gives them at a low site: the lowest 715 m above the
    // ground, the release 110 m above it, so 605 m of extrapolation (715 − 110, hand calculation).
    const plan = structuredClone(demo) as Record<string, unknown> & {
      winds: Record<string, unknown>;
    };
    plan.winds = {
      reference: 'AGL',
      layers: [
        { altitude_m: 715, fromDeg: 250, speed_mps: 7 },
        { altitude_m: 1630, fromDeg: 260, speed_mps: 12 },
      ],
    };
    await openPlan(plan);
    const warnings = page.locator('[data-testid=plan-warnings]');
    await expect
      .poll(() => warnings.innerText().catch(() => ''), { timeout: 30_000 })
      .toContain('is 605 m above the release');
    await expect.poll(() => status('wind-coverage'), { timeout: 30_000 }).toBe('warn');
    await expect(
      page.locator('sf-safety-panel [data-check=wind-coverage]').innerText(),
    ).resolves.toContain('605 m above the release');
    await shot(page, 'safety-wind-coverage');
    await page.locator('[data-tab=sites]').click();
    expect(await warnings.isVisible()).toBe(true);
    expect(errors).toEqual([]);
  });
});
