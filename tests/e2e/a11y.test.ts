// Keyboard and screen reader use of the app: axe-core's rules on every panel, the Tab count to the
// panels, the tabs' keys (WAI-ARIA Authoring Practices, "Tabs" pattern), the results table's one
// tab stop with Enter opening a site, and the focused map's keys on the selected site.
import { AxeBuilder } from '@axe-core/playwright';
import type { Browser, BrowserContext, Page } from 'playwright-core';
import { afterAll, afterEach, beforeAll, describe, expect, inject, it } from 'vitest';
import { launch, openApp, shot } from './browser';

let browser: Browser;
let context: BrowserContext | undefined;
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
  context = undefined;
});

async function open(): Promise<void> {
  ({ context, page, errors } = await openApp(browser, inject('baseUrl')));
}

/** The panel tabs in their order (seedfall-app.ts). */
const TABS = ['results', 'safety', 'plan', 'winds', 'sites', 'variants', 'settings'];

/** The element holding focus, looked for through shadow roots. */
function focused(p: Page): Promise<{ tag: string; tab: string; site: string; id: string }> {
  return p.evaluate(() => {
    let a: Element | null = document.activeElement;
    while (a?.shadowRoot?.activeElement) a = a.shadowRoot.activeElement;
    return {
      tag: a?.localName ?? '',
      tab: a?.getAttribute('data-tab') ?? '',
      site: a?.getAttribute('data-site') ?? '',
      id: a?.id ?? '',
    };
  });
}

/** A site's position in the plan being edited (the app's store). */
function sitePosition(p: Page, id: string): Promise<{ lat: number; lon: number }> {
  return p.evaluate((siteId) => {
    const app = document.querySelector('seedfall-app') as unknown as {
      store: { get(path: string): unknown };
    };
    const sites = app.store.get('sites') as { id: string; lat: number; lon: number }[];
    const s = sites.find((x) => x.id === siteId)!;
    return { lat: s.lat, lon: s.lon };
  }, id);
}

/** Serious and critical axe-core violations of the page as it is now (the rest is printed). */
async function axeProblems(label: string): Promise<string[]> {
  const r = await new AxeBuilder({ page }).analyze();
  const bad = r.violations.filter((v) => v.impact === 'serious' || v.impact === 'critical');
  const minor = r.violations.filter((v) => !bad.includes(v));
  if (minor.length)
    console.log(
      `${label}: axe (minor/moderate) ${minor.map((v) => `${v.id} ×${v.nodes.length} (${v.nodes[0].target.join(' > ')})`).join('; ')}`,
    );
  return bad.map(
    (v) =>
      `${label}: ${v.id} (${v.impact}) ${v.help} — ${v.nodes
        .slice(0, 3)
        .map((n) => n.target.join(' > '))
        .join(' | ')}`,
  );
}

const tab = (t: string) => page.locator(`seedfall-app nav [data-tab=${t}]`);
const row = (id: string) => page.locator(`sf-results-table tr[data-site="${id}"]`);
const details = () => page.locator('sf-site-details [data-testid=site-details]');

describe('keyboard and screen readers in Chromium', () => {
  it('axe-core finds no serious or critical violation on any panel, with the demo plan, with site details open and in the plans dialog', async () => {
    await open();
    await page.getByRole('button', { name: 'Demo plan' }).click();
    await page.locator('[data-testid=planned]').waitFor({ timeout: 60_000 });
    const problems: string[] = [];
    for (const t of TABS) {
      await tab(t).click();
      await expect
        .poll(() => page.locator(`seedfall-app #panel-${t}:not([hidden])`).count(), {
          timeout: 10_000,
        })
        .toBe(1);
      problems.push(...(await axeProblems(t)));
    }
    await tab('results').click();
    await row('s01').click();
    await details().waitFor({ timeout: 30_000 });
    problems.push(...(await axeProblems('site details')));
    // The plans dialog over the app.
    await page.locator('[data-testid=open-library]').click();
    await page.locator('[data-testid=plan-library][open]').waitFor({ timeout: 30_000 });
    problems.push(...(await axeProblems('plans dialog')));
    expect(problems).toEqual([]);
    expect(errors).toEqual([]);
    // Eight full-page axe runs over a map of SVG shapes: minutes on two busy cores.
  }, 600_000);

  it('reaches the panel tabs within 10 Tab presses, past a skip link that is shown when focused', async () => {
    await open();
    let presses = 0;
    for (let k = 1; k <= 30; k++) {
      await page.keyboard.press('Tab');
      const f = await focused(page);
      if (k === 1) {
        // WCAG 2.4.1 (bypass blocks): the first stop is the skip link, visible while focused.
        const skip = page.getByRole('link', { name: 'Skip to the panels' });
        expect(f.tag).toBe('a');
        const box = (await skip.boundingBox())!;
        expect(box.y).toBeGreaterThanOrEqual(0);
        expect(box.height).toBeGreaterThan(10);
        await shot(page, 'a11y-skip-link');
      }
      if (k === 3) await shot(page, 'a11y-header-button-focus');
      if (f.tab === 'results') {
        presses = k;
        break;
      }
    }
    expect(presses).toBeGreaterThan(0);
    expect(presses).toBeLessThanOrEqual(10);

    // The skip link itself: Enter from it lands on the selected tab.
    await page.reload();
    await page.locator('[data-testid=planned]').waitFor({ timeout: 60_000 });
    await page.keyboard.press('Tab');
    await page.keyboard.press('Enter');
    await expect.poll(async () => (await focused(page)).tab, { timeout: 10_000 }).toBe('results');
    expect(errors).toEqual([]);
  });

  it('moves between panel tabs with the arrow keys, Home and End; only the selected tab is a tab stop', async () => {
    await open();
    await tab('results').focus();
    await shot(page, 'a11y-tab-focus');
    const state = () =>
      page.locator('seedfall-app nav [role=tab]').evaluateAll((els) =>
        els.map((e) => ({
          tab: e.getAttribute('data-tab'),
          selected: e.getAttribute('aria-selected'),
          tabindex: e.getAttribute('tabindex'),
          controls: e.getAttribute('aria-controls'),
          id: e.id,
        })),
      );
    // WAI-ARIA Authoring Practices, Tabs: the tab controls its panel, which its tab labels.
    const panels = await page.locator('seedfall-app [role=tabpanel]').evaluateAll((els) =>
      els.map((e) => ({
        id: e.id,
        by: e.getAttribute('aria-labelledby'),
        hidden: (e as HTMLElement).hidden,
      })),
    );
    for (const t of await state()) {
      const panel = panels.find((p) => p.id === t.controls);
      expect(panel?.by).toBe(t.id);
      expect(panel?.hidden).toBe(t.selected !== 'true');
      expect(t.tabindex).toBe(t.selected === 'true' ? '0' : '-1');
    }
    const selectedNow = async () => (await state()).find((t) => t.selected === 'true')?.tab;

    await page.keyboard.press('ArrowRight');
    await expect.poll(async () => (await focused(page)).tab, { timeout: 10_000 }).toBe('safety');
    expect(await selectedNow()).toBe('safety');
    await expect(
      page.locator('seedfall-app #panel-safety').getAttribute('aria-labelledby'),
    ).resolves.toBe('tab-safety');
    await page.keyboard.press('End');
    await expect.poll(async () => (await focused(page)).tab, { timeout: 10_000 }).toBe('settings');
    await page.keyboard.press('ArrowRight'); // wraps to the first
    await expect.poll(async () => (await focused(page)).tab, { timeout: 10_000 }).toBe('results');
    await page.keyboard.press('ArrowLeft'); // and back to the last
    await expect.poll(async () => (await focused(page)).tab, { timeout: 10_000 }).toBe('settings');
    await page.keyboard.press('Home');
    await expect.poll(async () => (await focused(page)).tab, { timeout: 10_000 }).toBe('results');
    expect(await selectedNow()).toBe('results');
    const stops = (await state()).filter((t) => t.tabindex === '0').map((t) => t.tab);
    expect(stops).toEqual(['results']);
    expect(errors).toEqual([]);
  });

  it('the result rows are one tab stop; Down moves between them and Enter opens the focused site', async () => {
    await open();
    await tab('results').focus();
    // Tab from the selected tab into the results tab's content until a row has the focus.
    let reached = false;
    for (let k = 0; k < 40 && !reached; k++) {
      await page.keyboard.press('Tab');
      reached = (await focused(page)).tag === 'tr';
    }
    expect(reached).toBe(true);
    const stops = await page
      .locator('sf-results-table tbody tr')
      .evaluateAll((els) => els.filter((e) => e.getAttribute('tabindex') === '0').length);
    expect(stops).toBe(1);
    const first = (await focused(page)).site;
    await page.keyboard.press('ArrowDown');
    const second = (await focused(page)).site;
    expect(second).not.toBe(first);
    expect(second).not.toBe('');
    await shot(page, 'a11y-row-focus');
    await page.keyboard.press('Enter');
    await details().waitFor({ timeout: 30_000 });
    await expect(details().getAttribute('data-site')).resolves.toBe(second);
    // The row that had the focus stays the table's tab stop.
    await expect(row(second).getAttribute('tabindex')).resolves.toBe('0');
    expect(errors).toEqual([]);
  });

  it('the map is one focusable element; its arrow keys move the selected site (undoable) and Enter opens its details', async () => {
    await open();
    // No drawn shape or mark is a tab stop; only the map and its zoom buttons are.
    const stopsInMap = await page
      .locator('sf-map #map')
      .evaluate((map) =>
        [...map.querySelectorAll<HTMLElement>('*')]
          .filter((e) => e.tabIndex >= 0 && !e.closest('.leaflet-control-container'))
          .map((e) => e.className),
      );
    expect(stopsInMap).toEqual([]);
    expect(await page.locator('sf-map #map').getAttribute('tabindex')).toBe('0');

    // With no site selected, an arrow key pans the map (Leaflet's keys): the marker moves on screen.
    const marker = page.locator('sf-map .sf-site[data-site=s01]');
    const before = (await marker.boundingBox())!;
    const at0 = await sitePosition(page, 's01');
    await page.locator('sf-map #map').focus();
    await page.keyboard.press('ArrowRight');
    await expect
      .poll(async () => (await marker.boundingBox())!.x, { timeout: 10_000 })
      .toBeLessThan(before.x - 5);
    expect(await sitePosition(page, 's01')).toEqual(at0);

    // Select the site (its results row: the marker may still be gliding with the pan) and move
    // it with the keys: east, then north. The details take the focus first; then the map.
    await row('s01').click();
    await expect.poll(async () => (await focused(page)).tag, { timeout: 10_000 }).toBe('h2');
    await page.locator('sf-map #map').focus();
    await page.keyboard.press('ArrowRight');
    await expect
      .poll(async () => (await sitePosition(page, 's01')).lon, { timeout: 10_000 })
      .toBeGreaterThan(at0.lon);
    const east = await sitePosition(page, 's01');
    // A screen step east keeps the latitude (Web Mercator rows are parallels), to the 7 decimals kept.
    expect(Math.abs(east.lat - at0.lat)).toBeLessThan(2e-7);
    await page.keyboard.press('ArrowUp');
    await expect
      .poll(async () => (await sitePosition(page, 's01')).lat, { timeout: 10_000 })
      .toBeGreaterThan(at0.lat);
    await expect(
      page.locator('sf-map #map').evaluate((e) => getComputedStyle(e).outlineStyle),
    ).resolves.toBe('solid');
    await shot(page, 'a11y-map-focus');
    // Each press is one undo step: two undos restore the position before the keys.
    await page.keyboard.press('Control+z');
    await expect.poll(() => sitePosition(page, 's01'), { timeout: 10_000 }).toEqual(east);
    await page.keyboard.press('Control+z');
    await expect.poll(() => sitePosition(page, 's01'), { timeout: 10_000 }).toEqual(at0);

    // Enter opens the details of the selected site, from any tab, and gives them the focus.
    await tab('winds').click();
    await page.locator('sf-map #map').focus();
    await page.keyboard.press('Enter');
    await details().waitFor({ timeout: 30_000 });
    await expect(details().getAttribute('data-site')).resolves.toBe('s01');
    await expect.poll(async () => (await focused(page)).tag, { timeout: 10_000 }).toBe('h2');
    // Escape on the focused map clears the selection.
    await page.locator('sf-map #map').focus();
    await page.keyboard.press('Escape');
    await expect.poll(() => details().count(), { timeout: 10_000 }).toBe(0);

    // A marker click selects too; Leaflet then hides the map's focus ring until a key reaches
    // the window, and the map's own keys stop before it: the ring must come back all the same.
    await marker.click();
    await page.locator('sf-map #map').focus();
    await page.keyboard.press('ArrowLeft');
    await expect
      .poll(async () => (await sitePosition(page, 's01')).lon, { timeout: 10_000 })
      .toBeLessThan(at0.lon);
    await expect(
      page.locator('sf-map #map').evaluate((e) => getComputedStyle(e).outlineStyle),
    ).resolves.toBe('solid');
    expect(errors).toEqual([]);
  });
});
