import { execFileSync } from 'node:child_process';
import { mkdtempSync, statSync, writeFileSync } from 'node:fs';
import { tmpdir } from 'node:os';
import { join } from 'node:path';
import type { Browser, BrowserContext, Page } from 'playwright-core';
import { afterAll, afterEach, beforeAll, describe, expect, inject, it } from 'vitest';
import demo from '../../data/demo-plan.json';
import { type PlanFile, resolvePlan } from '../../app/plan';
import { sweepHeightsAGL, terrainArea } from '../../app/planner';
import { launch, openApp, shot, watchErrors } from './browser';

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

const dir = mkdtempSync(join(tmpdir(), 'seedfall-terrain-'));

/**
 * An inclined plane over the demo plan: z = Z0 + A·(lon − lon0) + B·(lat − lat0), metres MSL. Its
 * bilinear interpolation between cell centres is the plane itself, so the height the app reads
 * at any point is this closed form. // common practice (bilinear interpolation reproduces planes)
 */
const plan = resolvePlan(demo as unknown as PlanFile);
const lon0 = plan.release.lon;
const lat0 = plan.release.lat;
const Z0 = 89;
const A = 3000; // m per degree of longitude (≈ 4 % rising to the east at 47.5° N)
const B = 1500; // m per degree of latitude (≈ 1.4 % rising to the north)
const plane = (lat: number, lon: number): number => Z0 + A * (lon - lon0) + B * (lat - lat0);

/**
 * The area the plan needs with what the altitude sweep's highest release (twice the planned
 * height) needs, and a margin: the grid covers that but not the plan area grown to twice its size,
 * so the app reads the smaller of the areas it tries.
 */
const area = terrainArea(plan);
const top = Math.max(...sweepHeightsAGL(plan, plan.release.altitude_m + plan.groundElevation_m));
const sweep = terrainArea({
  ...plan,
  release: { ...plan.release, altitude_m: top, reference: 'AGL' },
});
const CELL = 0.0005; // degrees
const MARGIN = 0.003;
const west = Math.min(area.west, sweep.west) - MARGIN;
const south = Math.min(area.south, sweep.south) - MARGIN;
const NCOLS = Math.ceil((Math.max(area.east, sweep.east) + MARGIN - west) / CELL);
const NROWS = Math.ceil((Math.max(area.north, sweep.north) + MARGIN - south) / CELL);

function planeAsc(): string {
  const lines = [
    `ncols ${NCOLS}`,
    `nrows ${NROWS}`,
    `xllcorner ${west}`,
    `yllcorner ${south}`,
    `cellsize ${CELL}`,
    'NODATA_value -9999',
  ];
  for (let r = 0; r < NROWS; r++) {
    const lat = south + (NROWS - r - 0.5) * CELL; // row 0 is the northmost
    const row: string[] = [];
    for (let c = 0; c < NCOLS; c++) row.push(plane(lat, west + (c + 0.5) * CELL).toFixed(4));
    lines.push(row.join(' '));
  }
  return `${lines.join('\n')}\n`;
}

function write(name: string, data: string | Uint8Array): string {
  const p = join(dir, name);
  writeFileSync(p, data);
  return p;
}

const section = () => page.locator('sf-terrain-section');
const fileInput = () => section().locator('input[data-testid=terrain-file]');
const row = (id: string) => page.locator(`sf-results-table tr[data-site="${id}"]`);
const details = () => page.locator('sf-site-details [data-testid=site-details]');
const text = (sel: string) => section().locator(sel).innerText();

/** The demo site whose typed elevation is farthest from the plane, with the plane's height there. */
function farSite(): { id: string; model_m: number } {
  const rows = plan.sites.map((s) => ({
    id: s.id,
    model_m: plane(s.lat, s.lon),
    d: Math.abs(plane(s.lat, s.lon) - s.elevation_m),
  }));
  rows.sort((a, b) => b.d - a.d);
  expect(rows[0].d).toBeGreaterThan(5); // the test needs one the app must call different
  return rows[0];
}

async function tab(name: string): Promise<void> {
  await page.locator(`seedfall-app nav [data-tab=${name}]`).click();
}

/** The site details of `id` show the ground the planner read from the plane. */
async function expectTerrainInDetails(id: string, model_m: number): Promise<void> {
  await tab('results');
  await row(id).click();
  await details().waitFor({ timeout: 30_000 });
  // Planning over terrain takes a while on a loaded machine: poll generously.
  await expect
    .poll(() => details().locator('[data-testid=site-ground]').count(), { timeout: 180_000 })
    .toBe(1);
  await expect(details().locator('[data-testid=site-ground]').innerText()).resolves.toContain(
    `typed; the model says ${Math.round(model_m)} m`,
  );
  await expect(details().locator('[data-testid=landing-ground]').innerText()).resolves.toMatch(
    /Ground at the nominal landing of .+: \d+ m MSL/,
  );
  expect(await details().locator('[data-testid=ground-profile] svg').count()).toBe(1);
}

describe('an elevation model in the app (Chromium)', () => {
  it('opens a DEM, plans over it, brings it back after a reload, and refuses bad files keeping the model in use', async () => {
    ({ context, page, errors } = await openApp(browser, inject('baseUrl')));
    const planePath = write('plane.asc', planeAsc());
    const site = farSite();

    await tab('plan');
    await expect(section().locator('[data-testid=terrain-none]').count()).resolves.toBe(1);
    await fileInput().setInputFiles(planePath);
    await expect
      .poll(() => section().locator('[data-testid=terrain-name]').count(), { timeout: 60_000 })
      .toBe(1);
    expect(await text('[data-testid=terrain-name]')).toBe('plane.asc');
    // The grid is too small to hold twice the plan area, so a smaller area is read: a window of
    // the file, never more than the file.
    const read = await text('[data-testid=terrain-read]');
    const m = /([\d,]+) × ([\d,]+) = [\d,]+ cells of ([\d,]+) × ([\d,]+)/.exec(read);
    expect(m, read).not.toBeNull();
    const [cols, rows, fileCols, fileRows] = m!.slice(1).map((v) => Number(v.replace(/,/g, '')));
    expect([fileCols, fileRows]).toEqual([NCOLS, NROWS]);
    expect(cols).toBeLessThanOrEqual(NCOLS);
    expect(rows).toBeLessThanOrEqual(NROWS);
    expect(cols * rows).toBeGreaterThan(0.5 * NCOLS * NROWS);
    // The smaller side is shown: 0.0005° of longitude at 47.5° N is 0.0005 × 111 320 m × cos 47.5°
    // ≈ 37.6 m, of latitude ≈ 55 m (a degree is 111.32 km along the equator, // from memory).
    expect(await text('[data-testid=terrain-cell]')).toMatch(/^3[78]\.\d m/);
    expect(await text('[data-testid=terrain-area]')).toContain('covers the plan area');
    await section().locator('[data-testid=terrain-remove]').scrollIntoViewIfNeeded();
    await shot(page, 'terrain-section-read');

    await expectTerrainInDetails(site.id, site.model_m);
    await shot(page, 'terrain-site-details');
    await details().locator('[data-testid=ground-profile]').scrollIntoViewIfNeeded();
    await shot(page, 'terrain-site-details-profile');

    // The altitude sweep and the timeline run in their own worker over the same model.
    await tab('winds');
    await page.getByRole('button', { name: 'Compute' }).click();
    await expect
      .poll(
        async () =>
          (await page.locator('[data-testid=sweep] svg').count()) +
          (await page.locator('sf-wind-sources .problems').count()),
        { timeout: 120_000 },
      )
      .toBeGreaterThan(0);
    await shot(page, 'terrain-sweep');
    expect(await page.locator('sf-wind-sources .problems').allInnerTexts()).toEqual([]);

    // Reload: the model comes back from the browser's storage with the autosaved plan.
    await page.reload();
    await page.locator('[data-testid=planned]').waitFor({ timeout: 60_000 });
    await tab('plan');
    await expect
      .poll(() => section().locator('[data-testid=terrain-name]').count(), { timeout: 60_000 })
      .toBe(1);
    expect(await text('[data-testid=terrain-name]')).toBe('plane.asc');
    await expectTerrainInDetails(site.id, site.model_m);

    // A corrupt GeoTIFF: the message names it; the model in use and the results stay.
    const junk = new Uint8Array(4096);
    let x = 12345;
    for (let i = 0; i < junk.length; i++) {
      x = (1103515245 * x + 12345) % 2 ** 31; // a fixed pseudo-random fill
      junk[i] = x >> 23;
    }
    await tab('plan');
    await fileInput().setInputFiles(write('bad.tif', junk));
    await expect
      .poll(() => section().locator('[data-testid=terrain-error]').count(), { timeout: 60_000 })
      .toBe(1);
    expect(await text('[data-testid=terrain-error]')).toMatch(/^bad\.tif: /);
    await expect(page.locator('[data-testid=notice]').innerText()).resolves.toContain('bad.tif');
    expect(await text('[data-testid=terrain-name]')).toBe('plane.asc');
    await section().locator('[data-testid=terrain-error]').scrollIntoViewIfNeeded();
    await shot(page, 'terrain-bad-tif');

    // An ASCII grid with a wrong header: the same.
    const wrong = planeAsc().replace(/^nrows \d+/m, 'nrows -3');
    await fileInput().setInputFiles(write('wrong.asc', wrong));
    await expect
      .poll(() => text('[data-testid=terrain-error]'), { timeout: 60_000 })
      .toMatch(/^wrong\.asc: line 2: nrows -3 must be a whole number/);
    expect(await text('[data-testid=terrain-name]')).toBe('plane.asc');
    await section().locator('[data-testid=terrain-error]').scrollIntoViewIfNeeded();
    await shot(page, 'terrain-wrong-asc');
    // The results stay those planned over the model.
    await expectTerrainInDetails(site.id, site.model_m);

    // A release moved off the model: the planner's message names the file, the results stay.
    await tab('plan');
    const lat = page.locator('sf-plan-panel input[data-path="release.lat"]');
    await lat.fill(String(lat0 + 0.2));
    await lat.press('Enter');
    await expect
      .poll(() => page.locator('footer .notice-error').allInnerTexts(), { timeout: 120_000 })
      .toContainEqual(expect.stringMatching(/^Planning failed: plane\.asc: the elevation model/));
    // The file is read again for the new area, and says it does not reach that far.
    await expect
      .poll(() => text('[data-testid=terrain-error]').catch(() => ''), { timeout: 60_000 })
      .toMatch(/^plane\.asc: the elevation model covers only part of the plan area/);
    expect(await text('[data-testid=terrain-name]')).toBe('plane.asc');
    await shot(page, 'terrain-off-model');
    await expectTerrainInDetails(site.id, site.model_m);
    expect(errors).toEqual([]);
  });
});

/** The numbers of the section's "Read" line: window cols, rows, file cols, rows. */
async function readLine(): Promise<{ cells: number[]; read_MB: number; file_MB: number }> {
  const t = await text('[data-testid=terrain-read]');
  const m =
    /([\d,]+) × ([\d,]+) = [\d,]+ cells of ([\d,]+) × ([\d,]+);\s+([\d.]+) MB of ([\d.]+) MB/.exec(
      t,
    );
  expect(m, t).not.toBeNull();
  return {
    cells: m!.slice(1, 5).map((v) => Number(v.replace(/,/g, ''))),
    read_MB: Number(m![5]),
    file_MB: Number(m![6]),
  };
}

describe('a 4000 × 4000 GeoTIFF in the app (Chromium)', () => {
  it('reads only a window about the plan area, and reads again only when an edit leaves it', async () => {
    // Float32 heights, 0.0001° cells (about 7.5 m × 11 m here), 0.4° square about the release,
    // tiled: made by GDAL's gdal_create (Debian gdal-bin), 64 MB of cells.
    const tif = join(dir, 'big.tif');
    const h = 0.2;
    execFileSync('gdal_create', [
      ...['-q', '-of', 'GTiff', '-outsize', '4000', '4000', '-bands', '1', '-ot', 'Float32'],
      ...['-burn', '89', '-a_srs', 'EPSG:4326', '-co', 'TILED=YES'],
      ...['-a_ullr', `${lon0 - h}`, `${lat0 + h}`, `${lon0 + h}`, `${lat0 - h}`],
      tif,
    ]);
    ({ context, page, errors } = await openApp(browser, inject('baseUrl')));
    await tab('plan');
    await fileInput().setInputFiles(tif);
    await expect
      .poll(() => section().locator('[data-testid=terrain-name]').count(), { timeout: 120_000 })
      .toBe(1);
    const first = await readLine();
    expect(first.cells.slice(2)).toEqual([4000, 4000]);
    // The plan area grown to twice its width and height: about 0.153° × 0.098° of the 0.4°
    // square (terrainArea of the demo plan), so well under half the cells and the bytes.
    expect(first.cells[0] * first.cells[1]).toBeLessThan(0.25 * 4000 * 4000);
    expect(first.cells[0]).toBeGreaterThan((2 * (area.east - area.west)) / 0.0001);
    expect(first.file_MB).toBeCloseTo(statSync(tif).size / 1e6, 0);
    expect(first.read_MB).toBeLessThan(first.file_MB / 4);
    const areaRead = await text('[data-testid=terrain-area]');
    expect(areaRead).toContain('covers the plan area');
    await section().locator('[data-testid=terrain-remove]').scrollIntoViewIfNeeded();
    await shot(page, 'terrain-big-tif');

    // A small move of the release stays inside the window read: once the loader has checked
    // the new plan area, nothing has been read again.
    const counts = () =>
      page.evaluate(() => {
        const app = document.querySelector('seedfall-app') as unknown as {
          store: { terrain: { reads: number; areaChecks: number } };
        };
        return { ...app.store.terrain };
      });
    // Opening named the model in the plan (terrain.file): one check of the area follows that edit.
    await expect
      .poll(async () => (await counts()).areaChecks, { timeout: 60_000 })
      .toBeGreaterThan(0);
    const before = await counts();
    const lon = page.locator('sf-plan-panel input[data-path="release.lon"]');
    await lon.fill(String(lon0 + 0.002));
    await lon.press('Enter');
    await expect
      .poll(async () => (await counts()).areaChecks, { timeout: 60_000 })
      .toBeGreaterThan(before.areaChecks);
    expect((await counts()).reads).toBe(before.reads);
    expect(await text('[data-testid=terrain-area]')).toBe(areaRead);

    // A move of 0.1° (7.5 km) east leaves it: the file is read again about the new plan area.
    await lon.fill(String(lon0 + 0.1));
    await lon.press('Enter');
    await expect
      .poll(() => text('[data-testid=terrain-area]'), { timeout: 120_000 })
      .not.toBe(areaRead);
    await expect
      .poll(() => text('[data-testid=terrain-area]'), { timeout: 120_000 })
      .toContain('covers the plan area');
    expect(await section().locator('[data-testid=terrain-error]').count()).toBe(0);
    expect((await counts()).reads).toBe(before.reads + 1);
    expect(errors).toEqual([]);
  });
});

describe('an elevation model when the browser will not keep it (Chromium)', () => {
  it('is used for this visit and says it could not be kept', async () => {
    context = await browser.newContext({ viewport: { width: 1280, height: 800 } });
    // A browser whose storage is full: every IndexedDB open fails as a quota error would.
    await context.addInitScript(() => {
      IDBFactory.prototype.open = () => {
        throw new DOMException('The quota has been exceeded.', 'QuotaExceededError');
      };
    });
    page = await context.newPage();
    errors = watchErrors(page);
    await page.goto(inject('baseUrl'));
    await page.locator('[data-testid=planned]').waitFor({ timeout: 60_000 });
    await tab('plan');
    await fileInput().setInputFiles(write('plane.asc', planeAsc()));
    await expect
      .poll(() => section().locator('[data-testid=terrain-error]').count(), { timeout: 60_000 })
      .toBe(1);
    expect(await text('[data-testid=terrain-error]')).toBe(
      'plane.asc is in use but could not be kept for the next visit or offline use: browser storage is full',
    );
    expect(await text('[data-testid=terrain-name]')).toBe('plane.asc');
    await expect(page.locator('[data-testid=notice]').innerText()).resolves.toContain(
      'could not be kept',
    );
    await section().locator('[data-testid=terrain-error]').scrollIntoViewIfNeeded();
    await shot(page, 'terrain-not-kept');
    expect(errors).toEqual([]);
  });
});

describe('a kept elevation model that no longer reads (Chromium)', () => {
  it('is reported and kept until removed', async () => {
    ({ context, page, errors } = await openApp(browser, inject('baseUrl')));
    // What the app keeps (app/ui/terrain-store.ts): the model is kept with the plan being edited,
    // in the plan library's dems store under the plan's id; written as a damaged file would be found.
    const put = (record: { name: string; text: string }) =>
      page.evaluate(
        (r) =>
          new Promise<boolean>((resolve, reject) => {
            const req = indexedDB.open('seedfall-library');
            req.onerror = () => reject(req.error);
            req.onsuccess = () => {
              const db = req.result;
              const tx = db.transaction(['dems', 'meta'], 'readwrite');
              let done = false;
              const cur = tx.objectStore('meta').get('current');
              cur.onsuccess = () =>
                typeof cur.result === 'string' &&
                (done = true) &&
                tx
                  .objectStore('dems')
                  .put(
                    { name: r.name, file: new Blob([r.text]), savedAt: '' },
                    cur.result as string,
                  );
              tx.oncomplete = () => {
                db.close();
                resolve(done);
              };
              tx.onerror = () => reject(tx.error);
            };
          }),
        record,
      );
    const kept = () =>
      page.evaluate(
        () =>
          new Promise<unknown>((resolve, reject) => {
            const req = indexedDB.open('seedfall-library');
            req.onerror = () => reject(req.error);
            req.onsuccess = () => {
              const db = req.result;
              const tx = db.transaction(['dems', 'meta']);
              let name: string | null = null;
              const cur = tx.objectStore('meta').get('current');
              cur.onsuccess = () => {
                const get = tx.objectStore('dems').get(cur.result as string);
                get.onsuccess = () =>
                  (name = (get.result as { name?: string } | undefined)?.name ?? null);
              };
              tx.oncomplete = () => {
                db.close();
                resolve(name);
              };
            };
          }),
      );
    // Once the library is open (a plan is current) the record goes in.
    await expect
      .poll(() => put({ name: 'gone.asc', text: 'ncols 3\nnrows 3\ncellsize 0.1\n' }), {
        timeout: 30_000,
      })
      .toBe(true);
    await page.reload();
    await page.locator('[data-testid=planned]').waitFor({ timeout: 60_000 });
    await tab('plan');
    await expect
      .poll(() => section().locator('[data-testid=terrain-error]').count(), { timeout: 60_000 })
      .toBe(1);
    expect(await text('[data-testid=terrain-error]')).toMatch(
      /^gone\.asc: .*\(the model kept in this browser stays kept; Remove deletes it\)$/,
    );
    expect(await text('[data-testid=terrain-kept]')).toBe('gone.asc');
    expect(await kept()).toBe('gone.asc');
    await section().locator('[data-testid=terrain-error]').scrollIntoViewIfNeeded();
    await shot(page, 'terrain-kept-unreadable');
    await section().locator('[data-testid=terrain-remove]').click();
    await expect.poll(() => kept(), { timeout: 30_000 }).toBeNull();
    expect(await section().locator('[data-testid=terrain-kept]').count()).toBe(0);
    expect(errors).toEqual([]);
  });
});
