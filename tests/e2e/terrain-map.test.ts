// The terrain on the map: an ASCII grid opened through the Terrain section is drawn as hillshade
// and contours beneath the plan's marks, the cursor readout gives the ground height there, the
// steered sites' reach areas become polygons over the ground, and the layer switches off.
import { mkdtempSync, rmSync, writeFileSync } from 'node:fs';
import { tmpdir } from 'node:os';
import { join } from 'node:path';
import type { Browser, BrowserContext } from 'playwright-core';
import { afterAll, afterEach, beforeAll, describe, expect, inject, it } from 'vitest';
import { launch, openApp, shot } from './browser';

let browser: Browser;
let context: BrowserContext | undefined;
let dir = '';

// An invented landscape around the demo plan (release 47.493 N, 21.079 E, ground 89 m): a hill
// of 45 m some 450 m south-east of the sites, a gentle ripple, and a narrow ridge 50 m high
// across the wind 40 m upwind of site s10 (47.492964 N, 21.084646 E), in WGS 84 degrees.
const GRID = { west: 21.035, south: 47.46, cell: 0.0002, cols: 450, rows: 330 };
const UPWIND = (290 * Math.PI) / 180;
const height = (lat: number, lon: number): number => {
  const dy = (lat - 47.4895) * 111_200;
  const dx = (lon - 21.0845) * 75_200;
  const sx = (lon - 21.084646) * 75_200;
  const sy = (lat - 47.492964) * 111_200;
  const along = sx * Math.sin(UPWIND) + sy * Math.cos(UPWIND);
  const across = -sx * Math.cos(UPWIND) + sy * Math.sin(UPWIND);
  return (
    89 +
    45 * Math.exp(-(dx * dx + dy * dy) / (2 * 250 * 250)) +
    3 * Math.sin(dx / 160) * Math.cos(dy / 210) +
    50 * Math.exp(-((along - 40) ** 2) / (2 * 12 * 12) - (across * across) / (2 * 120 * 120))
  );
};

beforeAll(async () => {
  browser = await launch();
  dir = mkdtempSync(join(tmpdir(), 'seedfall-terrain-map-'));
  const lines = [
    `ncols ${GRID.cols}`,
    `nrows ${GRID.rows}`,
    `xllcorner ${GRID.west}`,
    `yllcorner ${GRID.south}`,
    `cellsize ${GRID.cell}`,
    'NODATA_value -9999',
  ];
  for (let r = 0; r < GRID.rows; r++) {
    const lat = GRID.south + (GRID.rows - r - 0.5) * GRID.cell;
    const row: string[] = [];
    for (let c = 0; c < GRID.cols; c++) {
      row.push(height(lat, GRID.west + (c + 0.5) * GRID.cell).toFixed(3));
    }
    lines.push(row.join(' '));
  }
  writeFileSync(join(dir, 'varla-hills.asc'), lines.join('\n') + '\n');
});
afterAll(async () => {
  await browser?.close();
  if (dir) rmSync(dir, { recursive: true, force: true });
});
afterEach(async () => {
  await context?.close();
  context = undefined;
});

describe('terrain on the map', () => {
  it('draws the elevation model, reads the ground under the cursor, switches off and shows reach polygons', async () => {
    const opened = await openApp(browser, inject('baseUrl'));
    context = opened.context;
    const { page, errors } = opened;
    await page.locator('[data-tab=plan]').click();
    await page.locator('[data-testid=terrain-file]').setInputFiles(join(dir, 'varla-hills.asc'));
    const read = page.locator('[data-testid=terrain-name], [data-testid=terrain-error]');
    await read.first().waitFor({ timeout: 120_000 });
    // A model that could not be read says why (its message shown in the failure).
    expect(await page.locator('[data-testid=terrain-error]').allTextContents()).toEqual([]);

    // The switch appears with the model, on by default.
    const toggle = page.locator('sf-map input[data-kind=terrain]');
    await expect.poll(() => toggle.isChecked(), { timeout: 30_000 }).toBe(true);

    // The layer's canvas holds drawn pixels over most of the view (the model covers it all).
    const canvas = page.locator('sf-map canvas.sf-terrain');
    const drawnShare = () =>
      canvas.evaluate((el) => {
        const c = el as HTMLCanvasElement;
        const d = c.getContext('2d')!.getImageData(0, 0, c.width, c.height).data;
        let n = 0;
        for (let i = 3; i < d.length; i += 4) if (d[i] > 0) n++;
        return n / (c.width * c.height);
      });
    await expect.poll(drawnShare, { timeout: 60_000, interval: 500 }).toBeGreaterThan(0.2);

    // The cursor readout: position and the ground there, which is the landscape's own height
    // (bilinear between cells of 0.0002°: within a few cm of the smooth surface; shown to 1 m).
    const map = page.locator('sf-map #map');
    const box = (await map.boundingBox())!;
    const readout = page.locator('sf-map [data-testid=cursor-readout]');
    for (const [fx, fy] of [
      [0.3, 0.4],
      [0.7, 0.75],
    ]) {
      await page.mouse.move(box.x + fx * box.width, box.y + fy * box.height);
      await expect.poll(() => readout.textContent(), { timeout: 10_000 }).toMatch(/ground/);
      const text = (await readout.textContent()) ?? '';
      const m = /^(-?[\d.]+), (-?[\d.]+) · ground (-?\d+) m$/.exec(text);
      expect(m, text).not.toBeNull();
      const want = height(Number(m![1]), Number(m![2]));
      expect(Math.abs(Number(m![3]) - want), text).toBeLessThanOrEqual(1);
    }
    await shot(page, 'terrain-map');
    // Zoomed out, the whole hill (for a person to look at: shading, contours, labels, marks).
    const scale = page.locator('sf-map .leaflet-control-scale-line').first();
    const before = await scale.textContent();
    await page.locator('sf-map .leaflet-control-zoom-out').click();
    await expect.poll(() => scale.textContent(), { timeout: 10_000 }).not.toBe(before);
    await expect.poll(() => page.locator('sf-map .leaflet-zoom-anim').count()).toBe(0);
    await expect.poll(drawnShare, { timeout: 60_000, interval: 500 }).toBeGreaterThan(0.2);
    await shot(page, 'terrain-map-wide');

    await toggle.uncheck();
    await expect.poll(() => canvas.count(), { timeout: 10_000 }).toBe(0);
    await shot(page, 'terrain-map-off');
    await toggle.check();
    await expect.poll(drawnShare, { timeout: 60_000, interval: 500 }).toBeGreaterThan(0.2);

    // Over terrain the steered variants' reach areas are polygons where each ray meets the
    // ground (once the plan has been flown over the model).
    await page.locator('sf-map input[data-kind=reach]').check();
    await expect
      .poll(() => page.locator('sf-map path.sf-reach-ground').count(), {
        timeout: 120_000,
        interval: 1000,
      })
      .toBeGreaterThan(0);
    await shot(page, 'terrain-map-reach');

    // The ridge hides s10 from the descent of a steered variant aimed at it: with every variant
    // shown, a mark stands where that descent meets the ridge, its tooltip saying how.
    await page.locator('sf-map input[data-kind=chosen-only]').uncheck();
    const hidden = page.locator('sf-map path.sf-hidden');
    await expect.poll(() => hidden.count(), { timeout: 60_000, interval: 1000 }).toBeGreaterThan(0);
    const tip = page.locator('sf-map .leaflet-tooltip');
    const tips: string[] = [];
    for (const box of await hidden.evaluateAll((els) =>
      els.map((e) => {
        const b = e.getBoundingClientRect();
        return { x: b.x + b.width / 2, y: b.y + b.height / 2 };
      }),
    )) {
      await page.mouse.move(box.x, box.y);
      await tip.first().waitFor({ timeout: 10_000 });
      tips.push(...(await tip.allTextContents()));
      await page.mouse.move(5, 5);
    }
    expect(tips).toContainEqual(
      expect.stringMatching(/^Hidden: ground \d+ m above the site, [\d.]+ m before its10 · /),
    );
    await shot(page, 'terrain-map-hidden');

    expect(errors).toEqual([]);
  }, 400_000);
});
