import { mkdtempSync, readFileSync, writeFileSync } from 'node:fs';
import { tmpdir } from 'node:os';
import { join } from 'node:path';
import type { Browser, BrowserContext, Page } from 'playwright-core';
import { afterAll, afterEach, beforeAll, describe, expect, inject, it } from 'vitest';
import { validatePlan } from '../../app/plan/validate';
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

/** A fresh browser profile on the app, waiting for the first planning result. */
async function open(viewport = { width: 1280, height: 800 }): Promise<void> {
  ({ context, page, errors } = await openApp(browser, inject('baseUrl'), viewport));
}

/** Waits until planning has caught up with the last edit. */
async function settled(): Promise<void> {
  await page.locator('[data-testid=planned]').waitFor({ timeout: 30_000 });
}

const count = (sel: string) => page.locator(`sf-map ${sel}`).count();
const rowText = (id: string) => page.locator(`sf-results-table tr[data-site=${id}]`).innerText();

/** Drags an element by (dx, dy) pixels in small steps, as a hand would. */
async function drag(sel: string, dx: number, dy: number, steps = 20): Promise<void> {
  const box = await page.locator(sel).first().boundingBox();
  if (!box) throw new Error(`${sel} is not visible`);
  const x = box.x + box.width / 2;
  const y = box.y + box.height / 2;
  await page.mouse.move(x, y);
  await page.mouse.down();
  for (let i = 1; i <= steps; i++) {
    await page.mouse.move(x + (dx * i) / steps, y + (dy * i) / steps);
    await page.waitForTimeout(16);
  }
  await page.mouse.up();
}

describe('the map planner in Chromium', () => {
  it('draws the demo plan: fitted map, sites, release point, track and every result layer', async () => {
    await open();
    expect(await count('.sf-site')).toBe(12);
    expect(await count('.sf-release')).toBe(1);
    expect(await count('path.sf-track')).toBe(1);
    // By default the chosen variant's 95 % ellipse and window (map.test.ts checks the defaults);
    // switched on: per site one landing and one 50 % ellipse, a reach area for every steered
    // choice (the table's variants other than the passive plain-drifter), and a window beside
    // the track for each site whose row gives one.
    for (const kind of ['reach', 'ellipse50', 'landing'])
      await page.locator(`sf-map input[data-kind=${kind}]`).check();
    expect(await count('path.sf-ellipse95')).toBe(12);
    expect(await count('path.sf-ellipse50')).toBe(12);
    expect(await count('path.sf-landing')).toBe(12);
    const chosen = await page.locator('sf-results-table tbody tr td:nth-child(2)').allInnerTexts();
    const steered = chosen.filter((v) => !v.startsWith('plain-drifter')).length;
    expect(steered).toBeGreaterThanOrEqual(10); // the demo steers nearly every site: never 0 = 0
    expect(await count('path.sf-reach')).toBe(steered);
    const windows = await count('path.sf-window');
    const withWindow = (
      await page.locator('sf-results-table td[data-col=window]').allInnerTexts()
    ).filter((t) => t.trim() !== 'none').length;
    expect(withWindow).toBeGreaterThanOrEqual(5); // most demo sites have one: never 0 = 0
    expect(windows).toBe(withWindow);
    expect(await page.locator('sf-results-table tbody tr').count()).toBe(12);
    // Every site marker lies inside the map view (the view is fitted to the plan).
    const map = await page.locator('sf-map #map').boundingBox();
    for (const b of await page
      .locator('sf-map .sf-site')
      .evaluateAll((els) => els.map((e) => e.getBoundingClientRect().toJSON() as DOMRect))) {
      expect(b.x).toBeGreaterThan(map!.x);
      expect(b.x + b.width).toBeLessThan(map!.x + map!.width);
    }
    // The grid and scale stand in for tiles.
    expect(await page.locator('sf-map .leaflet-control-scale').count()).toBe(1);
    await expect(page.locator('[role=note]').first().innerText()).resolves.toContain(
      'landowner permission',
    );
    // Comparing variants draws one set of shapes per variant.
    await page.locator('sf-map input[data-kind=chosen-only]').uncheck();
    expect(await count('path.sf-ellipse95')).toBe(36);
    await shot(page, 'planner-all-variants');
    await page.locator('sf-map input[data-kind=chosen-only]').check();
    await shot(page, 'planner-start');
    expect(errors).toEqual([]);
  });

  it('dragging a site changes its results', async () => {
    await open();
    const before = await rowText('s09');
    await page.evaluate(() => ((window as unknown as { longTasks: number[] }).longTasks = []));
    await drag('sf-map .sf-site[data-site=s09]', 60, 45);
    const longest = await page.evaluate(() =>
      Math.max(0, ...(window as unknown as { longTasks: number[] }).longTasks),
    );
    // Reported, not asserted: a time limit in a test races the machine's load (speed targets
    // belong in the bench); a person reads it in the test output.
    console.log(`drag: longest main-thread task ${Math.round(longest)} ms`);
    await settled();
    await expect.poll(() => rowText('s09'), { timeout: 15_000 }).not.toBe(before);
    // The drag is one undo step.
    await page.getByRole('button', { name: 'Undo' }).click();
    await settled();
    await expect.poll(() => rowText('s09'), { timeout: 15_000 }).toBe(before);
    await shot(page, 'planner-after-drag');
    expect(errors).toEqual([]);
  });

  it('turning the track handle changes the track and keeps the speed', async () => {
    await open();
    const rel = (await page.locator('sf-map .sf-release').boundingBox())!;
    const hd = (await page.locator('sf-map .sf-track-handle').boundingBox())!;
    const cx = rel.x + rel.width / 2;
    const cy = rel.y + rel.height / 2;
    const hx = hd.x + hd.width / 2;
    const hy = hd.y + hd.height / 2;
    // Rotate the handle 20° about the release point at the same distance.
    const a = (20 * Math.PI) / 180;
    const dx = (hx - cx) * Math.cos(a) - (hy - cy) * Math.sin(a) + cx - hx;
    const dy = (hx - cx) * Math.sin(a) + (hy - cy) * Math.cos(a) + cy - hy;
    await drag('sf-map .sf-track-handle', dx, dy);
    await page.locator('[data-tab=plan]').click();
    const track = Number(
      await page.locator('sf-plan-panel input[data-path="carrier.trackDeg"]').inputValue(),
    );
    expect(Math.abs(track - 270)).toBeLessThan(3); // 250° turned 20° clockwise on screen
    await expect(
      page.locator('sf-plan-panel input[data-path="carrier.groundSpeed_mps"]').inputValue(),
    ).resolves.toBe('13');
    expect(errors).toEqual([]);
  });

  it('changing a wind layer moves the reach areas', async () => {
    await open();
    await page.locator('sf-map input[data-kind=reach]').check();
    const d0 = await page.locator('sf-map path.sf-reach').first().getAttribute('d');
    await page.locator('[data-tab=winds]').click();
    const speed = page.locator('sf-wind-panel input[data-path="winds.layers[2].speed_mps"]');
    await speed.fill('12');
    await speed.press('Enter');
    await settled();
    await expect
      .poll(() => page.locator('sf-map path.sf-reach').first().getAttribute('d'), {
        timeout: 15_000,
      })
      .not.toBe(d0);
    await shot(page, 'planner-wind-edit');
    expect(errors).toEqual([]);
  });

  it('keeps an edit across a reload (autosave)', async () => {
    await open();
    await page.locator('[data-tab=plan]').click();
    const alt = page.locator('sf-plan-panel input[data-path="release.altitude_m"]');
    await alt.fill('95');
    await alt.press('Enter');
    await page.waitForTimeout(400);
    await page.reload();
    await settled();
    await page.locator('[data-tab=plan]').click();
    // The plan comes back from the plan library (IndexedDB), read after the page starts.
    await expect
      .poll(
        () => page.locator('sf-plan-panel input[data-path="release.altitude_m"]').inputValue(),
        { timeout: 30_000 },
      )
      .toBe('95');
    expect(errors).toEqual([]);
  });

  it('shows a bad number beside its field, keeps it, and keeps the last valid result', async () => {
    await open();
    const before = await rowText('s01');
    await page.locator('[data-tab=plan]').click();
    const lat = page.locator('sf-plan-panel input[data-path="release.lat"]');
    await lat.fill('12x');
    await lat.press('Enter');
    const field = page.locator('sf-number-field[path="release.lat"]');
    await expect(field.locator('.field-error').innerText()).resolves.toMatch(
      /release\.lat: .*number.*between -90 and 90/,
    );
    await expect(lat.inputValue()).resolves.toBe('12x');
    // Out of range: kept, explained with the allowed range, result kept with a notice.
    await lat.fill('95');
    await lat.press('Enter');
    await expect(field.locator('.field-error').innerText()).resolves.toContain(
      'release.lat must be between -90 and 90',
    );
    await expect(page.locator('[data-testid=stale]').innerText()).resolves.toContain(
      'last valid result',
    );
    // The release point stays where it last was valid instead of leaving the map.
    const mapBox = (await page.locator('sf-map #map').boundingBox())!;
    const rel = (await page.locator('sf-map .sf-release').boundingBox())!;
    expect(rel.y).toBeGreaterThan(mapBox.y);
    expect(rel.y).toBeLessThan(mapBox.y + mapBox.height);
    await page.locator('[data-tab=results]').click();
    expect(await rowText('s01')).toBe(before);
    expect(await count('.sf-site')).toBe(12);
    await shot(page, 'planner-bad-input');
    expect(errors).toEqual([]);
  });

  it('keeps text being typed when a planning result arrives meanwhile', async () => {
    await open();
    await page.locator('[data-tab=plan]').click();
    const alt = page.locator('sf-plan-panel input[data-path="release.altitude_m"]');
    await alt.fill('7'); // typing, not yet committed with Enter or Tab
    // Another edit elsewhere makes the store change and the worker answer while the field is dirty.
    await page.evaluate(() => {
      const app = document.querySelector('seedfall-app') as unknown as {
        store: { edit: (p: string, v: unknown) => void };
      };
      app.store.edit('requiredPHit', 0.85);
    });
    await settled();
    await page.waitForTimeout(300);
    await expect(alt.inputValue()).resolves.toBe('7');
    expect(errors).toEqual([]);
  });

  it('refuses a broken plan file with a clear message and loses nothing', async () => {
    await open();
    const dir = mkdtempSync(join(tmpdir(), 'seedfall-'));
    const notJson = join(dir, 'broken.json');
    writeFileSync(notJson, '{ "format": "seedfall-plan", ');
    await page.locator('input[data-testid=open-file]').setInputFiles(notJson);
    await expect(page.locator('[data-testid=notice]').innerText()).resolves.toMatch(
      /broken\.json was not opened: it is not JSON.*unchanged/,
    );
    const bad = join(dir, 'bad-plan.json');
    writeFileSync(
      bad,
      JSON.stringify({
        format: 'seedfall-plan',
        version: 1,
        release: { lat: 0, lon: 0, altitude_m: 100 },
        variants: [{ id: 'a', guidance: 'passive', descentRate_mps: -2 }],
        sites: [],
      }),
    );
    await page.locator('input[data-testid=open-file]').setInputFiles(bad);
    await expect
      .poll(() => page.locator('[data-testid=notice]').innerText())
      .toContain('variants[0].descentRate_mps must be between 0.05 and 30');
    expect(await count('.sf-site')).toBe(12);
    expect(await page.locator('sf-results-table tbody tr').count()).toBe(12);
    await shot(page, 'planner-broken-file');
    expect(errors).toEqual([]);
  });

  it('adds a site by clicking the map, and a results row click shows it', async () => {
    await open();
    await page.getByRole('button', { name: 'Add sites by clicking' }).click();
    const map = await page.locator('sf-map #map').boundingBox();
    await page.mouse.click(map!.x + map!.width * 0.8, map!.y + map!.height * 0.85);
    await expect.poll(() => count('.sf-site')).toBe(13);
    await settled();
    await expect.poll(() => page.locator('sf-results-table tbody tr').count()).toBe(13);
    await page.locator('sf-results-table tr[data-site=s13]').click();
    await expect(page.locator('sf-map .leaflet-tooltip').first().innerText()).resolves.toContain(
      'Site s13',
    );
    expect(errors).toEqual([]);
  });

  it('shows lengths in feet and speeds in knots when chosen', async () => {
    await open();
    await page.locator('[data-tab=settings]').click();
    await page.locator('select[data-setting=length]').selectOption('ft');
    await page.locator('select[data-setting=speed]').selectOption('kt');
    await page.locator('[data-tab=plan]').click();
    // 110 m = 360.892 ft (international foot, 0.3048 m exactly); 13 m/s = 25.2700 kt (1852 m/h);
    // shown by the height and speed rules of app/ui/units.ts (whole feet, tenths of a knot).
    await expect(
      page.locator('sf-plan-panel input[data-path="release.altitude_m"]').inputValue(),
    ).resolves.toBe('361');
    await expect(
      page.locator('sf-plan-panel input[data-path="carrier.groundSpeed_mps"]').inputValue(),
    ).resolves.toBe('25.3');
    expect(errors).toEqual([]);
  });

  it('takes a site position typed as MGRS and shows it back in the chosen format', async () => {
    await open();
    await page.locator('[data-tab=settings]').click();
    await page.locator('select[data-setting=coords]').selectOption('mgrs');
    await page.locator('[data-tab=sites]').click();
    const pos = page.locator('sf-coord-field[path="sites[0]"] input');
    // MGRS of 47.49300 N, 21.08100 E as the mgrs package (reference library) writes it, 1 m
    // precision; typed without spaces as a crew member might.
    await pos.fill('34TET0610159954');
    await pos.press('Enter');
    const latField = page.locator('input[data-path="sites[0].lat"]');
    const lonField = page.locator('input[data-path="sites[0].lon"]');
    await expect
      .poll(async () => Math.abs(Number(await latField.inputValue()) - 47.493))
      .toBeLessThan(2e-5);
    await expect
      .poll(async () => Math.abs(Number(await lonField.inputValue()) - 21.081))
      .toBeLessThan(2e-5);
    await expect.poll(() => pos.inputValue()).toMatch(/^34T ET 0610\d 5995\d$/);
    await pos.fill('not a place');
    await pos.press('Enter');
    await expect(
      page.locator('sf-coord-field[path="sites[0]"] .field-error').innerText(),
    ).resolves.toContain('sites[0].position');
    await expect(pos.inputValue()).resolves.toBe('not a place');
    expect(errors).toEqual([]);
  });

  it('saves the plan as a JSON file that validates and holds the edits', async () => {
    await open();
    await page.locator('[data-tab=plan]').click();
    const alt = page.locator('sf-plan-panel input[data-path="release.altitude_m"]');
    await alt.fill('101');
    await alt.press('Enter');
    const [download] = await Promise.all([
      page.waitForEvent('download'),
      page.getByRole('button', { name: 'Save' }).click(),
    ]);
    const path = await download.path();
    const saved = JSON.parse(readFileSync(path, 'utf8'));
    expect(saved.format).toBe('seedfall-plan');
    expect(saved.release.altitude_m).toBe(101);
    expect(validatePlan(saved).ok).toBe(true);
    expect(download.suggestedFilename()).toMatch(/\.json$/);
  });

  it('shows P(hit) ± its standard error and the error sources it includes; turbulence none drops the gusts', async () => {
    await open();
    const table = page.locator('sf-results-table');
    const included = table.locator('[data-testid=included]');
    // "0.91 ± 0.01": two decimals each, "± <0.01" when the error rounds to 0.00 (issue 11).
    for (const cell of await table.locator('td[data-col=phit]').allInnerTexts())
      expect(cell.trim()).toMatch(/^\d\.\d\d ± (<0\.01|0\.\d\d)$/);
    // The demo plan leaves turbulence at auto: gusts and vertical air are modelled.
    await expect(included.innerText()).resolves.toMatch(
      /^Included error sources: forecast wind error, gusts, vertical air, /,
    );
    await expect(included.locator('[data-source=gust]').getAttribute('title')).resolves.toContain(
      "modelled: turbulence from the plan's wind at 20 ft",
    );
    await shot(page, 'planner-results-se');

    // A landing ellipse's tooltip gives that fall's gust and vertical air and the sources.
    // The largest ellipse, pointed at above its centre where the site marker does not cover it.
    const boxes = await page
      .locator('sf-map path.sf-ellipse95')
      .evaluateAll((els) => els.map((e) => e.getBoundingClientRect().toJSON() as DOMRect));
    const big = boxes.reduce((a, b) => (b.width * b.height > a.width * a.height ? b : a));
    await page.mouse.move(big.x + big.width / 2, big.y + big.height * 0.2);
    const tip = page.locator('sf-map .leaflet-tooltip', { hasText: /\d+ % landing ellipse ·/ });
    await expect(tip.innerText()).resolves.toMatch(
      /This fall: gust 1σ [\d.]+ m\/s, correlation time [\d.]+ s · vertical air 1σ [\d.]+ m\/s/,
    );
    await expect(tip.innerText()).resolves.toContain('Included error sources: forecast wind error');
    await shot(page, 'planner-ellipse-tooltip');

    const before = await table.locator('tbody').innerText();
    await page.locator('[data-tab=plan]').click();
    const turb = page.locator('sf-plan-panel select[data-path="uncertainty.turbulence"]');
    await expect(turb.inputValue()).resolves.toBe('auto');
    await turb.selectOption('none');
    await settled();
    await page.locator('[data-tab=results]').click();
    await expect.poll(() => included.innerText(), { timeout: 15_000 }).not.toContain('gusts');
    await expect(included.innerText()).resolves.not.toContain('vertical air');
    await expect(table.locator('tbody').innerText()).resolves.not.toBe(before);

    // A set gust replaces the modelled one; out of range it is kept and explained with the range.
    await page.locator('[data-tab=plan]').click();
    const gust = page.locator('sf-plan-panel input[data-path="uncertainty.gust_mps"]');
    await expect(gust.getAttribute('placeholder')).resolves.toBe('modelled');
    await gust.fill('20');
    await gust.press('Enter');
    await expect(
      page.locator('sf-number-field[path="uncertainty.gust_mps"] .field-error').innerText(),
    ).resolves.toContain('uncertainty.gust_mps must be between 0 and 10');
    await expect(gust.inputValue()).resolves.toBe('20');
    await gust.fill('1');
    await gust.press('Enter');
    await settled();
    await page.locator('sf-plan-panel .hint', { hasText: 'Turbulence' }).scrollIntoViewIfNeeded();
    await shot(page, 'planner-plan-panel-turbulence');
    await page.locator('[data-tab=results]').click();
    await expect.poll(() => included.innerText(), { timeout: 15_000 }).toContain('gusts');
    await expect(included.locator('[data-source=gust]').getAttribute('title')).resolves.toContain(
      '1 m/s per component (set)',
    );
    // Clearing the field removes the key (the modelled value applies), not 0 or "".
    await page.locator('[data-tab=plan]').click();
    await gust.fill('');
    await gust.press('Enter');
    await settled();
    const [download] = await Promise.all([
      page.waitForEvent('download'),
      page.getByRole('button', { name: 'Save' }).click(),
    ]);
    const saved = JSON.parse(readFileSync(await download.path(), 'utf8'));
    expect(saved.uncertainty.turbulence).toBe('none');
    expect('gust_mps' in saved.uncertainty).toBe(false);
    expect(errors).toEqual([]);
  });

  it('is usable on a tablet-sized screen', async () => {
    await open({ width: 800, height: 1100 });
    expect(await count('.sf-site')).toBe(12);
    await shot(page, 'planner-tablet');
    expect(errors).toEqual([]);
  });
});

describe('exchange formats in the app', () => {
  it('imports a messy sites CSV, keeping good rows and listing bad ones by line', async () => {
    await open();
    await page.locator('[data-tab=sites]').click();
    const dir = mkdtempSync(join(tmpdir(), 'seedfall-sites-'));
    const csv = join(dir, 'field-sheet.csv');
    // Semicolon-separated with decimal commas, a BOM, a quoted name and one bad latitude.
    writeFileSync(
      csv,
      '\ufeffid;name;lat;lon\r\nn1;"Reed bed; north";47,49310;21,08020\r\nn2;Bad row;95,2;21,081\r\n\r\nn3;Levee foot;47,49250;21,08300\r\n',
    );
    await page.locator('input[data-testid=import-sites]').setInputFiles(csv);
    await expect.poll(() => count('.sf-site')).toBe(14);
    await expect(page.locator('sf-sites-panel .problems').innerText()).resolves.toMatch(/line 3/);
    await expect(page.locator('[data-testid=notice]').innerText()).resolves.toContain(
      '2 site(s) added',
    );
    expect(errors).toEqual([]);
  });

  it('exports GeoJSON that holds every site and the hazard area', async () => {
    await open();
    const [download] = await Promise.all([
      page.waitForEvent('download'),
      page.getByRole('button', { name: 'GeoJSON' }).click(),
    ]);
    const fc = JSON.parse(readFileSync(await download.path(), 'utf8'));
    expect(fc.type).toBe('FeatureCollection');
    const kinds = fc.features.map((f: { properties: { kind: string } }) => f.properties.kind);
    expect(kinds.filter((k: string) => k === 'site').length).toBe(12);
    expect(kinds).toContain('hazard');
    expect(download.suggestedFilename()).toMatch(/\.geojson$/);
  });
});
