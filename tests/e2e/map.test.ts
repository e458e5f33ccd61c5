// The map stays legible: default layers, site labels that never overlap, the coordinate grid
// inside the map's own box, selection from a marker, no focus rectangle after a click, release
// window tooltips in reach with every layer on, and a 1,000-site plan on one canvas with its
// labels thinned. What is checked is what a person sees: element boxes and computed styles.
import type { Browser, BrowserContext, Page } from 'playwright-core';
import { afterAll, afterEach, beforeAll, describe, expect, inject, it } from 'vitest';
import { makeField } from '../support/make-field';
import { launch, openApp, shot, watchErrors } from './browser';

let browser: Browser;
let context: BrowserContext | undefined;

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

// common practice: 1280×800 and 1440×900 are the usual laptop screens; at 900 px the map's
// toolbar wraps onto several lines and the panel moves below the map (its row 60 % of the height).
const SIZES = [
  { width: 1280, height: 800 },
  { width: 1440, height: 900 },
  { width: 900, height: 800 },
  // A short window: the map's row is then lower than the wrapped toolbar and a usable map.
  { width: 900, height: 520 },
];

interface Rect {
  x0: number;
  y0: number;
  x1: number;
  y1: number;
}

/** Visible site labels: text and box (display none and empty boxes left out). */
function labelBoxes(page: Page): Promise<{ text: string; r: Rect; site: string }[]> {
  return page.locator('sf-map .site-label').evaluateAll((els) =>
    els
      .map((e) => {
        const b = e.getBoundingClientRect();
        const site = e.closest('[data-site]')?.getAttribute('data-site') ?? '';
        return {
          text: e.textContent ?? '',
          site,
          r: { x0: b.left, y0: b.top, x1: b.right, y1: b.bottom },
        };
      })
      .filter((l) => l.r.x1 - l.r.x0 > 0 && l.r.y1 - l.r.y0 > 0),
  );
}

/** Pairs of labels whose boxes overlap (by more than half a pixel, for rounding). */
function overlapping(labels: { text: string; r: Rect }[]): string[] {
  const out: string[] = [];
  for (let i = 0; i < labels.length; i++)
    for (let j = i + 1; j < labels.length; j++) {
      const a = labels[i].r;
      const b = labels[j].r;
      if (a.x0 + 0.5 < b.x1 && b.x0 + 0.5 < a.x1 && a.y0 + 0.5 < b.y1 && b.y0 + 0.5 < a.y1)
        out.push(`${labels[i].text} / ${labels[j].text}`);
    }
  return out;
}

/**
 * The box each grid line and label is drawn in: its own box cut by every ancestor (through the
 * shadow roots) that clips what it holds (overflow other than visible, or paint containment);
 * and the boxes of the page's other parts the grid must never cover.
 */
function gridAndNeighbours(page: Page): Promise<{
  map: Rect;
  grid: { what: string; r: Rect }[];
  others: { what: string; r: Rect }[];
}> {
  return page.evaluate(() => {
    const rect = (e: Element) => {
      const b = e.getBoundingClientRect();
      return { x0: b.left, y0: b.top, x1: b.right, y1: b.bottom };
    };
    const parentOf = (e: Element): Element | null =>
      e.parentElement ?? ((e.getRootNode() as ShadowRoot).host as Element | undefined) ?? null;
    const drawn = (e: Element) => {
      const r = rect(e);
      for (let a = parentOf(e); a; a = parentOf(a)) {
        const cs = getComputedStyle(a);
        if (cs.overflow !== 'visible' || /paint|strict|content/.test(cs.contain)) {
          const c = rect(a);
          r.x0 = Math.max(r.x0, c.x0);
          r.y0 = Math.max(r.y0, c.y0);
          r.x1 = Math.min(r.x1, c.x1);
          r.y1 = Math.min(r.y1, c.y1);
        }
      }
      return r;
    };
    const app = document.querySelector('seedfall-app')!.shadowRoot!;
    const mapHost = app.querySelector('sf-map')!;
    const root = mapHost.shadowRoot!;
    const pane = root.querySelector('.leaflet-seedfallGraticule-pane')!;
    const grid = [...pane.querySelectorAll('path, .seedfall-graticule-label span')]
      .filter((e) => getComputedStyle(e).display !== 'none')
      .map((e) => ({ what: e.localName === 'path' ? 'line' : (e.textContent ?? ''), r: drawn(e) }))
      .filter((g) => g.r.x1 > g.r.x0 && g.r.y1 > g.r.y0);
    const others = [
      ['header', app.querySelector('header')],
      ['caution', app.querySelector('.caution')],
      ['toolbar', root.querySelector('[role=toolbar]')],
      ['side panel', app.querySelector('aside')],
      ['status bar', app.querySelector('footer')],
    ]
      .filter((x): x is [string, Element] => x[1] !== null)
      .map(([what, e]) => ({ what, r: rect(e) }));
    return { map: rect(root.querySelector('#map')!), grid, others };
  });
}

const inside = (a: Rect, b: Rect): boolean =>
  a.x0 >= b.x0 - 0.5 && a.y0 >= b.y0 - 0.5 && a.x1 <= b.x1 + 0.5 && a.y1 <= b.y1 + 0.5;
const meets = (a: Rect, b: Rect): boolean =>
  a.x0 + 0.5 < b.x1 && b.x0 + 0.5 < a.x1 && a.y0 + 0.5 < b.y1 && b.y0 + 0.5 < a.y1;

describe('a legible map, in Chromium', () => {
  for (const size of SIZES) {
    it(`at ${size.width}×${size.height}: default layers, labels apart, the grid inside the map`, async () => {
      let page: Page;
      let errors: string[];
      ({ context, page, errors } = await openApp(browser, inject('baseUrl'), size));
      const count = (sel: string) => page.locator(`sf-map ${sel}`).count();
      await expect.poll(() => count('path.sf-ellipse95'), { timeout: 30_000 }).toBe(12);

      // Default layers: the chosen variant's 95 % ellipse and window, sites, release point,
      // track and hazard outline; reach areas, 50 % ellipses and landings wait for a site.
      expect(await count('.sf-site')).toBe(12);
      expect(await count('.sf-release')).toBe(1);
      expect(await count('path.sf-track')).toBe(1);
      expect(await count('path.sf-hazard')).toBeGreaterThanOrEqual(1);
      expect(await count('path.sf-reach')).toBe(0);
      expect(await count('path.sf-ellipse50')).toBe(0);
      expect(await count('path.sf-landing')).toBe(0);
      const withWindow = (
        await page.locator('sf-results-table td[data-col=window]').allInnerTexts()
      ).filter((t) => t.trim() !== 'none').length;
      expect(withWindow).toBeGreaterThanOrEqual(5); // most demo sites have one: never 0 = 0
      expect(await count('path.sf-window')).toBe(withWindow);
      for (const [kind, on] of [
        ['hazard', true],
        ['ellipse95', true],
        ['window', true],
        ['zone', true],
        ['reach', false],
        ['ellipse50', false],
        ['landing', false],
      ] as const)
        expect(await page.locator(`sf-map input[data-kind=${kind}]`).isChecked(), kind).toBe(on);

      // Each window lies in its own lane beside the track: no two windows share a line.
      const windowLines = await page
        .locator('sf-map path.sf-window')
        .evaluateAll((els) => els.map((e) => e.getAttribute('d')));
      expect(new Set(windowLines).size).toBe(windowLines.length);

      // Site labels: each shows its own id only (no merged "s04·08"), and no two overlap.
      const labels = await labelBoxes(page);
      expect(labels.length).toBeGreaterThanOrEqual(4); // most of 12 fit: never 0 = 0
      for (const l of labels) expect(l.text).toBe(l.site);
      expect(overlapping(labels)).toEqual([]);

      // The grid is drawn inside the map's box, and the map meets none of the page's other parts.
      const { map, grid, others } = await gridAndNeighbours(page);
      expect(grid.length).toBeGreaterThan(4);
      expect(grid.filter((g) => !inside(g.r, map)).map((g) => g.what)).toEqual([]);
      expect(others.filter((o) => meets(o.r, map)).map((o) => o.what)).toEqual([]);
      await shot(page, `map-${size.width}x${size.height}`);
      expect(errors).toEqual([]);
    });
  }

  it('a marker click selects the site; a map click leaves no focus rectangle', async () => {
    let page: Page;
    let errors: string[];
    ({ context, page, errors } = await openApp(browser, inject('baseUrl')));
    // The store tells its views; record what it said.
    await page.evaluate(() => {
      const app = document.querySelector('seedfall-app') as unknown as { store: EventTarget };
      const w = window as unknown as { selected: (string | null)[] };
      w.selected = [];
      app.store.addEventListener('select-site', (e) =>
        w.selected.push((e as CustomEvent<string | null>).detail),
      );
    });
    // A site with a window and a steered choice (the results table says which).
    const rows = await page.locator('sf-results-table tbody tr').evaluateAll((trs) =>
      trs.map((tr) => ({
        id: tr.getAttribute('data-site') ?? '',
        window: tr.querySelector('td[data-col=window]')?.textContent?.trim() ?? 'none',
      })),
    );
    const id = rows.find((r) => r.window !== 'none')!.id;
    await page.locator(`sf-map .sf-site[data-site=${id}] .site-dot`).click();
    await expect
      .poll(() => page.evaluate(() => (window as unknown as { selected: unknown[] }).selected))
      .toEqual([id]);
    await expect.poll(() => page.locator(`sf-map .sf-site.selected`).count()).toBe(1);
    expect(await page.locator(`sf-map .sf-site.selected`).getAttribute('data-site')).toBe(id);
    // Its window drawn on top, thicker, with its open and close times written beside it.
    expect(await page.locator('sf-map path.sf-window.sf-window-selected').count()).toBe(1);
    const times = await page.locator('sf-map .sf-window-time').allInnerTexts();
    expect(times).toHaveLength(2);
    expect(times[0]).toMatch(/^opens [+−]\d+\.\d s$/);
    expect(times[1]).toMatch(/^closes [+−]\d+\.\d s$/);
    // Its 95 % ellipse outlined, and its reach area, 50 % ellipse and landing shown.
    expect(await page.locator('sf-map path.sf-ellipse95-selected').count()).toBe(1);
    expect(await page.locator('sf-map path.sf-ellipse50.sf-focus').count()).toBe(1);
    expect(await page.locator('sf-map path.sf-landing.sf-focus').count()).toBe(1);
    await shot(page, 'map-selected');

    // A click on the map: whatever has the focus shows no outline (keyboard focus still does).
    const mapBox = (await page.locator('sf-map #map').boundingBox())!;
    await page.mouse.click(mapBox.x + mapBox.width - 60, mapBox.y + 60);
    const focused = await page.evaluate(() => {
      let el: Element | null = document.activeElement;
      while (el?.shadowRoot?.activeElement) el = el.shadowRoot.activeElement;
      const cs = el ? getComputedStyle(el) : null;
      return { id: el?.id ?? '', outline: cs ? `${cs.outlineStyle} ${cs.outlineWidth}` : '' };
    });
    expect(focused.id).toBe('map'); // the click did give the map the focus
    expect(focused.outline.startsWith('none')).toBe(true);
    // The scale and attribution are not text a pan can select.
    expect(
      await page
        .locator('sf-map .leaflet-control-scale-line')
        .first()
        .evaluate((e) => getComputedStyle(e).userSelect),
    ).toBe('none');
    await shot(page, 'map-after-click');
    expect(errors).toEqual([]);
  });

  it('a release window opens its tooltip under the pointer with every layer on', async () => {
    let page: Page;
    let errors: string[];
    ({ context, page, errors } = await openApp(browser, inject('baseUrl'), {
      width: 1440,
      height: 900,
    }));
    for (const kind of ['reach', 'ellipse50', 'landing'])
      await page.locator(`sf-map input[data-kind=${kind}]`).check();
    await expect.poll(() => page.locator('sf-map path.sf-ellipse50').count()).toBe(12);
    // Points along each window's line (a fifth to four fifths of its length), on screen.
    const windows = await page.locator('sf-map path.sf-window').evaluateAll((els) =>
      (els as SVGPathElement[]).map((e) => {
        const m = e.getScreenCTM()!;
        const len = e.getTotalLength();
        return [0.2, 0.35, 0.5, 0.65, 0.8].map((f) => {
          const p = e.getPointAtLength(len * f);
          return { x: m.a * p.x + m.c * p.y + m.e, y: m.b * p.x + m.d * p.y + m.f };
        });
      }),
    );
    expect(windows.length).toBeGreaterThanOrEqual(5);
    const tip = page.locator('sf-map .leaflet-tooltip', { hasText: /^Release window · / });
    let opened = 0;
    for (const points of windows) {
      // Reachable: somewhere along the window the pointer opens its tooltip (the release
      // point's own marker may sit on one spot of it).
      for (const p of points) {
        await page.mouse.move(p.x, p.y);
        const open = (await tip.count()) > 0;
        await page.mouse.move(5, 5);
        if (open) {
          opened++;
          break;
        }
      }
    }
    // Every window's tooltip is in reach: none is buried under another shape.
    expect(opened).toBe(windows.length);
    await page.mouse.move(windows[0][1].x, windows[0][1].y);
    await expect.poll(() => tip.count()).toBe(1);
    await shot(page, 'map-window-tooltip');
    // The switches are kept for the next visit (settings).
    await page.reload();
    await page.locator('[data-testid=planned]').waitFor({ timeout: 30_000 });
    expect(await page.locator('sf-map input[data-kind=reach]').isChecked()).toBe(true);
    expect(errors).toEqual([]);
  });

  it('draws a 1,000-site plan on one canvas and thins its labels', async () => {
    context = await browser.newContext({ viewport: { width: 1280, height: 800 } });
    await context.addInitScript(
      ([key, text]) => {
        if (localStorage.getItem('e2e.seeded') === null) {
          localStorage.setItem('e2e.seeded', '1');
          localStorage.setItem(key, text);
        }
      },
      ['seedfall.draft.v1', JSON.stringify(makeField(1000))] as const,
    );
    const page = await context.newPage();
    const errors = watchErrors(page);
    await page.goto(inject('baseUrl'));
    await page.locator('[data-testid=planned]').waitFor({ timeout: 180_000 });
    expect(await page.locator('sf-map .sf-site').count()).toBe(1000);
    // Result shapes on a canvas in the overlay pane, not a thousand SVG elements.
    await expect
      .poll(() => page.locator('sf-map .leaflet-overlay-pane canvas').count(), { timeout: 60_000 })
      .toBeGreaterThanOrEqual(1);
    expect(await page.locator('sf-map path.sf-ellipse95').count()).toBe(0);
    // Labels thinned at the fitted zoom: well under one per site, none overlapping.
    const labels = await labelBoxes(page);
    expect(labels.length).toBeGreaterThan(10);
    expect(labels.length).toBeLessThan(400);
    expect(overlapping(labels)).toEqual([]);
    await shot(page, 'map-1000-sites');
    expect(errors).toEqual([]);
  }, 420_000);
});
