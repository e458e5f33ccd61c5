import { mkdtempSync, writeFileSync } from 'node:fs';
import { tmpdir } from 'node:os';
import { join } from 'node:path';
import type { Browser, BrowserContext, Page } from 'playwright-core';
import { zxyToTileId } from 'pmtiles';
import { afterAll, afterEach, beforeAll, describe, expect, inject, it } from 'vitest';
import demo from '../../data/demo-plan.json';
import { type PlanFile, resolvePlan } from '../../app/plan';
import { terrainArea } from '../../app/planner';
import {
  command,
  mvtTile,
  pmtilesArchive,
  solidPng,
  TILE_MVT,
  TILE_PNG,
  tileId,
  type ArchiveSpec,
  zz,
} from './basemap-files';
import { launch, openApp, shot } from './browser';

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

const dir = mkdtempSync(join(tmpdir(), 'seedfall-basemap-'));
function write(name: string, data: Uint8Array): string {
  const p = join(dir, name);
  writeFileSync(p, data);
  return p;
}

const plan = resolvePlan(demo as unknown as PlanFile);
const area = terrainArea(plan);

/**
 * Tile column and row of a point: the Web Mercator tile numbering of the OpenStreetMap wiki's
 * "Slippy map tilenames" (x = ⌊(lon + 180)/360 · 2^z⌋, y = ⌊(1 − ln(tan φ + sec φ)/π)/2 · 2^z⌋).
 * // from memory
 */
const slippyX = (lon: number, z: number): number => Math.floor(((lon + 180) / 360) * 2 ** z);
const slippyY = (lat: number, z: number): number => {
  const phi = (lat * Math.PI) / 180;
  return Math.floor(((1 - Math.log(Math.tan(phi) + 1 / Math.cos(phi)) / Math.PI) / 2) * 2 ** z);
};
function tilesOver(
  b: { south: number; west: number; north: number; east: number },
  zMin: number,
  zMax: number,
): { z: number; x: number; y: number }[] {
  const out: { z: number; x: number; y: number }[] = [];
  for (let z = zMin; z <= zMax; z++) {
    for (let x = slippyX(b.west, z); x <= slippyX(b.east, z); x++) {
      for (let y = slippyY(b.north, z); y <= slippyY(b.south, z); y++) out.push({ z, x, y });
    }
  }
  return out;
}

/** The archive's colour and the tile server's (neither is a colour of the app's own drawing). */
const ARCHIVE_RGB = [40, 150, 210] as const;
const SERVER_RGB = [210, 120, 40] as const;
const HOSTILE = '<img src=x onerror="window.pwned=1">Invented Survey Tiles & Co';

/** A raster archive covering the view around the plan (a margin of 0.3°) from zoom 0 to 14. */
function rasterArchive(): ArchiveSpec {
  const b = {
    south: area.south - 0.3,
    west: area.west - 0.3,
    north: area.north + 0.3,
    east: area.east + 0.3,
  };
  return {
    tiles: tilesOver(b, 0, 14),
    tile: solidPng(ARCHIVE_RGB),
    tileType: TILE_PNG,
    minZoom: 0,
    maxZoom: 14,
    bounds: [b.west, b.south, b.east, b.north],
    metadata: { name: 'test raster', attribution: HOSTILE, format: 'png' },
  };
}

const panel = (page: Page) => page.locator('sf-basemap-panel');
const testid = (page: Page, id: string) => panel(page).locator(`[data-testid=${id}]`);

async function settingsTab(page: Page): Promise<void> {
  await page.locator('seedfall-app nav [data-tab=settings]').click();
}

/**
 * The colour of the base map's tile image under the middle of the map, read off the image
 * itself (its pixel at that point, drawn into a canvas), or null when no drawn tile is there.
 */
async function colourAtMapCentre(page: Page): Promise<number[] | null> {
  const box = await page.locator('sf-map #map').boundingBox();
  if (!box) return null;
  const cx = box.x + box.width / 2;
  const cy = box.y + box.height / 2;
  return page.locator('sf-map .sf-basemap img, sf-map .sf-basemap canvas').evaluateAll(
    (tiles, [px, py]) => {
      let found: number[] | null = null;
      for (const el of tiles as (HTMLImageElement | HTMLCanvasElement)[]) {
        const r = el.getBoundingClientRect();
        const img = el instanceof HTMLImageElement;
        const w = img ? el.naturalWidth : el.width;
        const h = img ? el.naturalHeight : el.height;
        if ((img && !el.complete) || w === 0 || el.style.visibility === 'hidden') continue;
        if (px < r.left || px >= r.right || py < r.top || py >= r.bottom) continue;
        const c = document.createElement('canvas');
        c.width = c.height = 1;
        const g = c.getContext('2d')!;
        g.drawImage(
          el,
          ((px - r.left) / r.width) * w,
          ((py - r.top) / r.height) * h,
          1,
          1,
          0,
          0,
          1,
          1,
        );
        try {
          found = [...g.getImageData(0, 0, 1, 1).data.slice(0, 3)];
        } catch {
          found = null; // an image from the server itself (cross-origin): not what is looked for
        }
      }
      return found;
    },
    [cx, cy] as const,
  );
}

const attributionText = (page: Page) =>
  page.locator('sf-map .leaflet-control-attribution').innerText();

/** Waits for the service worker to be active, so a reload works with the network gone. */
async function waitForWorker(page: Page): Promise<void> {
  await expect
    .poll(
      () =>
        page.evaluate(async () => {
          const r = await navigator.serviceWorker.getRegistration();
          return r?.active?.state ?? '';
        }),
      { timeout: 120_000 },
    )
    .toBe('activated');
}

async function reloaded(page: Page): Promise<void> {
  await page.reload();
  await page.locator('[data-testid=planned]').waitFor({ timeout: 60_000 });
}

describe('the offline base map (Chromium)', () => {
  it('writes tile ids as the PMTiles v3 reader numbers them', () => {
    // PMTiles v3 specification: z0 is id 0, zoom z starts after the (4^z − 1)/3 tiles above it.
    expect(tileId(0, 0, 0)).toBe(0);
    expect(tileId(1, 0, 0)).toBe(1);
    expect(tileId(2, 0, 0)).toBe(5);
    for (const [z, x, y] of [
      [1, 1, 0],
      [3, 5, 2],
      [12, 2287, 1434],
      [14, 9152, 5740],
    ]) {
      expect(tileId(z, x, y)).toBe(zxyToTileId(z, x, y));
    }
  });

  it('draws a raster PMTiles archive as the base layer, with its attribution as text, after a reload and offline', async () => {
    const opened = await openApp(browser, inject('baseUrl'));
    context = opened.context;
    const { page, errors } = opened;
    // No tiles by default: the grid alone.
    expect(await page.locator('sf-map .sf-basemap').count()).toBe(0);
    expect(await page.locator('sf-map input[data-kind=basemap]').count()).toBe(0);
    await settingsTab(page);
    await expect(testid(page, 'basemap-none').count()).resolves.toBe(1);

    await testid(page, 'basemap-file').setInputFiles(
      write('area.pmtiles', pmtilesArchive(rasterArchive())),
    );
    await expect.poll(() => testid(page, 'basemap-name').count(), { timeout: 30_000 }).toBe(1);
    expect(await testid(page, 'basemap-name').innerText()).toBe('area.pmtiles');
    expect(await testid(page, 'basemap-kind').innerText()).toContain('PNG, zooms 0 to 14');
    // The archive's attribution is shown as text in the panel and on the map: no element made.
    expect(await testid(page, 'basemap-attribution').innerText()).toBe(HOSTILE);
    await expect.poll(() => attributionText(page), { timeout: 30_000 }).toContain(HOSTILE);
    expect(await page.locator('sf-map .leaflet-control-attribution img').count()).toBe(0);
    await expect.poll(() => colourAtMapCentre(page), { timeout: 30_000 }).toEqual([...ARCHIVE_RGB]);
    await shot(page, 'basemap-archive');

    // The map bar's switch hides the base map and brings it back.
    await page.locator('sf-map input[data-kind=basemap]').uncheck();
    await expect.poll(() => page.locator('sf-map .sf-basemap').count()).toBe(0);
    await page.locator('sf-map input[data-kind=basemap]').check();
    await expect.poll(() => colourAtMapCentre(page), { timeout: 30_000 }).toEqual([...ARCHIVE_RGB]);

    // A file that is not an archive: named in the message; the archive in use stays.
    await testid(page, 'basemap-file').setInputFiles(write('junk.pmtiles', Buffer.alloc(4096, 7)));
    await expect.poll(() => testid(page, 'basemap-error').count(), { timeout: 30_000 }).toBe(1);
    expect(await testid(page, 'basemap-error').innerText()).toMatch(
      /^junk\.pmtiles: not a PMTiles version 3 archive/,
    );
    expect(await testid(page, 'basemap-name').innerText()).toBe('area.pmtiles');
    expect(await colourAtMapCentre(page)).toEqual([...ARCHIVE_RGB]);

    // After a reload the archive comes back from the browser's storage.
    await reloaded(page);
    await expect.poll(() => colourAtMapCentre(page), { timeout: 30_000 }).toEqual([...ARCHIVE_RGB]);
    await expect.poll(() => attributionText(page), { timeout: 30_000 }).toContain(HOSTILE);
    await settingsTab(page);
    expect(await testid(page, 'basemap-name').innerText()).toBe('area.pmtiles');

    // With the network gone, a reload still draws it (the app from the service worker's cache,
    // the archive from IndexedDB).
    await waitForWorker(page);
    await context.setOffline(true);
    await reloaded(page);
    await expect.poll(() => colourAtMapCentre(page), { timeout: 30_000 }).toEqual([...ARCHIVE_RGB]);
    await shot(page, 'basemap-archive-offline');
    expect(await page.evaluate(() => (window as unknown as { pwned?: number }).pwned)).toBe(
      undefined,
    );
    await context.setOffline(false);

    // An MVT vector archive is drawn in the app's own colours: water over the whole tile (the
    // app's water fill #b8d0dc) and roads (white on a casing).
    await settingsTab(page);
    const full = [
      command(1, 1),
      zz(0),
      zz(0),
      command(2, 3),
      zz(4096),
      zz(0),
      zz(0),
      zz(4096),
      zz(-4096),
      zz(0),
      command(7, 1),
    ];
    const vector = {
      ...rasterArchive(),
      tileType: TILE_MVT,
      tile: mvtTile([
        { name: 'water', features: [{ type: 3, geometry: full }] },
        {
          name: 'roads',
          // Eight roads across the tile, 512 apart, so every part of it a closer view draws has one.
          features: Array.from({ length: 8 }, (_, k) => ({
            type: 2,
            geometry: [command(1, 1), zz(0), zz(128 + 512 * k), command(2, 1), zz(4096), zz(0)],
          })),
        },
      ]),
      metadata: { attribution: 'Invented vector data' },
    };
    await testid(page, 'basemap-file').setInputFiles(
      write('vector.pmtiles', pmtilesArchive(vector)),
    );
    await expect
      .poll(() => testid(page, 'basemap-vector-note').count(), { timeout: 30_000 })
      .toBe(1);
    expect(await testid(page, 'basemap-kind').innerText()).toContain('MVT vector, zooms 0 to 14');
    await expect.poll(() => colourAtMapCentre(page), { timeout: 30_000 }).toEqual([184, 208, 220]);
    await expect.poll(() => attributionText(page)).toContain('Invented vector data');
    // A road's white (a 1.6 px line covers no pixel fully: near-white; water and casing are darker).
    const roadPixels = await page.locator('sf-map .sf-basemap canvas').evaluateAll((tiles) =>
      (tiles as HTMLCanvasElement[]).some((c) => {
        const d = c.getContext('2d')!.getImageData(0, 0, c.width, c.height).data;
        for (let i = 0; i < d.length; i += 4) {
          if (d[i] >= 235 && d[i + 1] >= 235 && d[i + 2] >= 235) return true;
        }
        return false;
      }),
    );
    expect(roadPixels).toBe(true);
    await shot(page, 'basemap-vector');

    // A tile kind the app cannot draw (MLT, spec tile type 6): named, the grid stays.
    await testid(page, 'basemap-file').setInputFiles(
      write('other.pmtiles', pmtilesArchive({ ...vector, tileType: 6 })),
    );
    await expect.poll(() => testid(page, 'basemap-not-drawn').count(), { timeout: 30_000 }).toBe(1);
    expect(await testid(page, 'basemap-not-drawn').innerText()).toContain(
      'MLT vector tiles cannot be drawn',
    );
    expect(await page.locator('sf-map [data-testid=basemap-note]').innerText()).toContain(
      'other.pmtiles: MLT vector tiles cannot be drawn; coordinate grid only',
    );
    expect(await page.locator('sf-map .sf-basemap').count()).toBe(0);

    // Removed: the grid alone again.
    await testid(page, 'basemap-forget').click();
    await expect.poll(() => testid(page, 'basemap-none').count()).toBe(1);
    expect(await page.locator('sf-map [data-testid=basemap-note]').count()).toBe(0);
    expect(errors).toEqual([]);
  });

  it('fetches and keeps the plan area’s tiles from the tile URL within a limit, and draws them offline', async () => {
    const opened = await openApp(browser, inject('baseUrl'));
    context = opened.context;
    const { page } = opened;
    const requested: string[] = [];
    let gate: (() => void) | null = null;
    let gated = new Promise<void>((resolve) => (gate = resolve));
    let failTile = '';
    const png = solidPng(SERVER_RGB);
    await context.route('http://tiles.invalid/**', async (route) => {
      const path = new URL(route.request().url()).pathname;
      requested.push(path);
      // Zoom 14 waits for the test, so the progress can be seen part way.
      if (path.startsWith('/14/')) await gated;
      if (path === failTile) return route.fulfill({ status: 404, body: 'no such tile' });
      return route.fulfill({
        status: 200,
        contentType: 'image/png',
        headers: { 'Access-Control-Allow-Origin': '*' },
        body: png,
      });
    });

    await settingsTab(page);
    expect(await testid(page, 'basemap-fetch-why').innerText()).toContain('Set a tile URL');
    const url = page.locator('[data-setting=tileUrl]');
    await url.fill('http://tiles.invalid/{z}/{x}/{y}.png');
    await url.dispatchEvent('change');
    const attribution = page.locator('[data-setting=tileAttribution]');
    await attribution.fill('Invented tile server <b>bold</b>');
    await attribution.dispatchEvent('change');
    await expect
      .poll(() => attributionText(page), { timeout: 30_000 })
      .toContain('Invented tile server <b>bold</b>');

    // Too large a range: refused before it starts, naming the limit.
    await testid(page, 'basemap-zmin').selectOption('0');
    await testid(page, 'basemap-zmax').selectOption('19');
    await expect(testid(page, 'basemap-limit').innerText()).resolves.toContain(
      'more than the limit of 5,000 tiles',
    );
    expect(await testid(page, 'basemap-fetch').isDisabled()).toBe(true);
    await shot(page, 'basemap-fetch-limit');

    // Zooms 12 to 14: the count (worked out here from the slippy-map formulas) and the size at
    // the stated 25 kB a tile are shown before the start.
    await testid(page, 'basemap-zmin').selectOption('12');
    await testid(page, 'basemap-zmax').selectOption('14');
    const expected = tilesOver(area, 12, 14);
    const low = expected.filter((t) => t.z < 14).length;
    const n = expected.length;
    expect(await testid(page, 'basemap-estimate').innerText()).toBe(
      `${n} tiles, about ${n * 25e3 < 1e6 ? `${n * 25} kB` : `${((n * 25e3) / 1e6).toFixed(1)} MB`} (at 25 kB a tile, a rough figure)`,
    );
    failTile = `/13/${expected[low - 1].x}/${expected[low - 1].y}.png`;

    // Started: zoom 14 is held back, so the progress stops at the tiles of zooms 12 and 13.
    await testid(page, 'basemap-fetch').click();
    await expect
      .poll(() => testid(page, 'basemap-fetch-status').innerText(), { timeout: 60_000 })
      .toContain(`Fetching: ${low} of ${n} tiles; ${low - 1} kept`);
    expect(
      await testid(page, 'basemap-progress').evaluate((p) => (p as HTMLProgressElement).value),
    ).toBe(low);
    await shot(page, 'basemap-fetch-progress');
    // Cancelled part way: it says so and keeps what it had.
    await testid(page, 'basemap-cancel').click();
    gate!();
    await expect
      .poll(() => testid(page, 'basemap-fetch-status').innerText(), { timeout: 60_000 })
      .toMatch(/^Cancelled: /);

    // Again, to the end: every tile asked for, the one failure counted and named.
    gated = new Promise<void>((resolve) => (gate = resolve));
    gate!();
    await testid(page, 'basemap-fetch').click();
    await expect
      .poll(() => testid(page, 'basemap-fetch-status').innerText(), { timeout: 120_000 })
      .toMatch(/^Finished: /);
    const status = await testid(page, 'basemap-fetch-status').innerText();
    expect(status).toContain(`${n} of ${n} tiles; ${n - 1} kept`);
    expect(status).toContain('1 failed');
    expect(await testid(page, 'basemap-failures').innerText()).toContain(failTile.slice(1, -4));
    for (const t of expected) expect(requested).toContain(`/${t.z}/${t.x}/${t.y}.png`);
    await expect.poll(() => testid(page, 'basemap-kept').innerText()).toBe(String(n - 1));
    await shot(page, 'basemap-fetch-done');

    // Offline, and the tile server gone too: the kept tiles are drawn from the browser's storage.
    await waitForWorker(page);
    await context.unroute('http://tiles.invalid/**');
    await context.route('http://tiles.invalid/**', (route) => route.abort());
    await context.setOffline(true);
    await reloaded(page);
    await expect.poll(() => colourAtMapCentre(page), { timeout: 30_000 }).toEqual([...SERVER_RGB]);
    await expect
      .poll(() => attributionText(page), { timeout: 30_000 })
      .toContain('Invented tile server <b>bold</b>');
    await shot(page, 'basemap-kept-offline');
    await context.setOffline(false);
  });
});

/** What the page's storage holds: the current plan, the plan ids, and the base map store's keys. */
interface Kept {
  current: string | null;
  plans: string[];
  archives: string[];
  tiles: string[];
}

const kept = (page: Page): Promise<Kept> =>
  page.evaluate(async () => {
    const open = (name: string) =>
      new Promise<IDBDatabase>((resolve, reject) => {
        const req = indexedDB.open(name);
        req.onerror = () => reject(req.error);
        req.onsuccess = () => resolve(req.result);
      });
    const all = <T>(db: IDBDatabase, store: string, what: 'keys' | 'one', key?: string) =>
      new Promise<T>((resolve, reject) => {
        if (!db.objectStoreNames.contains(store)) {
          resolve((what === 'keys' ? [] : null) as T);
          return;
        }
        const s = db.transaction(store).objectStore(store);
        const req = what === 'keys' ? s.getAllKeys() : s.get(key!);
        req.onerror = () => reject(req.error);
        req.onsuccess = () => resolve((req.result ?? null) as T);
      });
    const lib = await open('seedfall-library');
    const current = await all<string | null>(lib, 'meta', 'one', 'current');
    const plans = (await all<IDBValidKey[]>(lib, 'plans', 'keys')).map(String);
    lib.close();
    const bm = await open('seedfall-basemap');
    const archives = (await all<IDBValidKey[]>(bm, 'archives', 'keys')).map(String);
    const tiles = (await all<IDBValidKey[]>(bm, 'tiles', 'keys')).map((k) => JSON.stringify(k));
    bm.close();
    return { current, plans, archives, tiles };
  });

// A plan's files travel with it: opened with it, copied with it, deleted with it, and an earlier
// version's data moved once, not lost. // common practice
describe('the base map kept with each plan (Chromium)', () => {
  const plansView = (page: Page) => page.locator('sf-plan-library dialog');
  const planRow = (page: Page, id: string) => plansView(page).locator(`tr[data-plan="${id}"]`);
  async function showPlans(page: Page): Promise<void> {
    await page.locator('[data-testid=open-library]').click();
    await plansView(page).waitFor({ state: 'visible', timeout: 10_000 });
  }
  async function openPlan(page: Page, id: string): Promise<void> {
    await showPlans(page);
    await planRow(page, id).locator('[data-testid=open-plan]').click();
    await plansView(page).waitFor({ state: 'hidden', timeout: 60_000 });
    await expect.poll(async () => (await kept(page)).current, { timeout: 30_000 }).toBe(id);
  }
  /** No base layer drawn and the panel names none: the coordinate grid alone. */
  async function plainGrid(page: Page): Promise<void> {
    await settingsTab(page);
    await expect.poll(() => testid(page, 'basemap-none').count(), { timeout: 30_000 }).toBe(1);
    await expect.poll(() => page.locator('sf-map .sf-basemap').count()).toBe(0);
  }
  async function archiveShown(page: Page): Promise<void> {
    await expect.poll(() => colourAtMapCentre(page), { timeout: 30_000 }).toEqual([...ARCHIVE_RGB]);
    await settingsTab(page);
    await expect
      .poll(() => testid(page, 'basemap-name').innerText(), { timeout: 30_000 })
      .toBe('area.pmtiles');
  }

  it('follows the plan when plans are switched and after a reload, is copied with it and deleted with it', async () => {
    const opened = await openApp(browser, inject('baseUrl'));
    context = opened.context;
    const { page, errors } = opened;
    await expect.poll(async () => (await kept(page)).current, { timeout: 30_000 }).not.toBeNull();
    const a = (await kept(page)).current!;
    // A second plan, made before A has a base map: it has none.
    await showPlans(page);
    await planRow(page, a).locator('[data-testid=duplicate-plan]').click();
    await expect.poll(async () => (await kept(page)).plans.length, { timeout: 30_000 }).toBe(2);
    const b = (await kept(page)).plans.find((id) => id !== a)!;
    await plansView(page).locator('[data-testid=close-library]').click();

    // Plan A gets the archive; it is kept under A's id.
    await settingsTab(page);
    await testid(page, 'basemap-file').setInputFiles(
      write('area.pmtiles', pmtilesArchive(rasterArchive())),
    );
    await archiveShown(page);
    await expect.poll(async () => (await kept(page)).archives).toEqual([a]);
    await showPlans(page);
    await expect
      .poll(() => planRow(page, a).locator('[data-testid=plan-basemap]').innerText())
      .toBe('base map area.pmtiles');
    expect(await planRow(page, b).locator('[data-testid=plan-basemap]').count()).toBe(0);
    await shot(page, 'basemap-per-plan-list');
    await plansView(page).locator('[data-testid=close-library]').click();

    // Switching to B: the plain grid; back to A: the archive; after a reload, still so.
    await openPlan(page, b);
    await plainGrid(page);
    await reloaded(page);
    await expect.poll(async () => (await kept(page)).current).toBe(b);
    await plainGrid(page);
    await openPlan(page, a);
    await archiveShown(page);
    await reloaded(page);
    await archiveShown(page);

    // A copy of A takes its base map with it.
    await showPlans(page);
    await planRow(page, a).locator('[data-testid=duplicate-plan]').click();
    await expect.poll(async () => (await kept(page)).plans.length, { timeout: 30_000 }).toBe(3);
    const c = (await kept(page)).plans.find((id) => id !== a && id !== b)!;
    await expect.poll(async () => (await kept(page)).archives.sort()).toEqual([a, c].sort());
    await plansView(page).locator('[data-testid=close-library]').click();

    // Deleting A (from B) removes its archive from storage; Undo puts it back; the copy keeps its own.
    await openPlan(page, b);
    await plainGrid(page);
    await showPlans(page);
    await planRow(page, a).locator('[data-testid=delete-plan]').click();
    await expect.poll(async () => (await kept(page)).plans.length, { timeout: 30_000 }).toBe(2);
    await expect.poll(async () => (await kept(page)).archives).toEqual([c]);
    await plansView(page).locator('[data-testid=undo-delete]').click();
    await expect.poll(async () => (await kept(page)).archives.sort()).toEqual([a, c].sort());
    await planRow(page, a).locator('[data-testid=delete-plan]').click();
    await expect.poll(async () => (await kept(page)).archives).toEqual([c]);
    await plansView(page).locator('[data-testid=close-library]').click();
    await openPlan(page, c);
    await archiveShown(page);
    expect(errors).toEqual([]);
  });

  it('gives the one base map an earlier version kept to the plan open at the first start', async () => {
    context = await browser.newContext({ viewport: { width: 1280, height: 800 } });
    const page = await context.newPage();
    const base = inject('baseUrl');
    // A blank page of the app's origin writes what the earlier version kept, before the app runs.
    await context.route(`${base}seed.html`, (r) =>
      r.fulfill({ contentType: 'text/html', body: '<!doctype html><title>seed</title>' }),
    );
    await page.goto(`${base}seed.html`);
    const bytes = [...pmtilesArchive(rasterArchive())];
    const png = [...solidPng(SERVER_RGB)];
    await page.evaluate(
      ([archive, tile]) =>
        new Promise<void>((resolve, reject) => {
          const req = indexedDB.open('seedfall-basemap', 1);
          req.onupgradeneeded = () => {
            req.result.createObjectStore('archives');
            req.result.createObjectStore('tiles');
          };
          req.onerror = () => reject(req.error);
          req.onsuccess = () => {
            const db = req.result;
            const tx = db.transaction(['archives', 'tiles'], 'readwrite');
            tx.objectStore('archives').put(
              {
                name: 'area.pmtiles',
                file: new Blob([new Uint8Array(archive)]),
                savedAt: '2026-11-01T00:00:00Z',
              },
              'current',
            );
            tx.objectStore('tiles').put(
              { blob: new Blob([new Uint8Array(tile)], { type: 'image/png' }) },
              'http://tiles.invalid/{z}/{x}/{y}.png\n3/4/2',
            );
            tx.oncomplete = () => {
              db.close();
              resolve();
            };
            tx.onerror = () => reject(tx.error);
          };
        }),
      [bytes, png] as const,
    );
    const errors: string[] = [];
    page.on('pageerror', (e) => errors.push(e.message));
    await page.goto(base);
    await page.locator('[data-testid=planned]').waitFor({ timeout: 60_000 });
    await archiveShown(page);
    const k = await kept(page);
    expect(k.current).not.toBeNull();
    expect(k.archives).toEqual([k.current]);
    expect(k.tiles).toEqual([
      JSON.stringify([k.current, 'http://tiles.invalid/{z}/{x}/{y}.png\n3/4/2']),
    ]);
    // Once: after a reload it is still the plan's, and nothing else is kept.
    await reloaded(page);
    await archiveShown(page);
    expect(await kept(page)).toEqual(k);
    expect(errors).toEqual([]);
  });
});
