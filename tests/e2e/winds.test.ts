import type { Browser } from 'playwright-core';
import { afterAll, beforeAll, describe, expect, inject, it } from 'vitest';
import { timelineWindows, planZone } from '../../app/brief';
import { validatePlan } from '../../app/plan';
import { planTimeline, TIMELINE_STEP_S } from '../../app/planner';
import demo from '../../data/demo-plan.json';
import { launch, openApp, shot, watchErrors } from './browser';

let browser: Browser;
beforeAll(async () => {
  browser = await launch();
});
afterAll(async () => {
  await browser?.close();
});

// An invented bulletin in the open winds-aloft text layout (levels in ft MSL; groups DDffTT).
const BULLETIN = [
  'WINDS ALOFT FORECAST - INVENTED EXAMPLE FOR TESTS',
  'FT  3000    6000    9000   12000   18000   24000  30000  34000  39000',
  'VRX 2410 2515+06 2622+01 2730-04 2842-16 2955-28 306642 317451 318057',
  'KLW 9900 2208+04 2414-01 2521-06 2633-18 2745-30 285644 296552 297158',
].join('\n');

describe('wind inputs in Chromium', () => {
  it('decodes a pasted bulletin into the wind layers and redraws the profile plot', async () => {
    const context = await browser.newContext({ viewport: { width: 1280, height: 900 } });
    const page = await context.newPage();
    const errors = watchErrors(page);
    await page.goto(inject('baseUrl'));
    await page.locator('[data-testid=planned]').waitFor({ timeout: 30_000 });
    await page.locator('[data-tab=winds]').click();
    const plotBefore = await page.locator('[data-testid=wind-plot] path.sp').getAttribute('d');
    expect(await page.locator('sf-wind-panel tr[data-layer]').count()).toBe(6);
    await page.locator('[data-testid=bulletin]').fill(BULLETIN);
    await page.getByRole('button', { name: 'Decode' }).click();
    await page.locator('[data-testid=station]').selectOption('VRX');
    await page.getByRole('button', { name: /Use this station/ }).click();
    // 3000 … 39000 ft: nine levels above the plan's 89 m ground.
    await expect.poll(() => page.locator('sf-wind-panel tr[data-layer]').count()).toBe(9);
    await expect(
      page.locator('sf-wind-panel select[data-path="winds.reference"]').inputValue(),
    ).resolves.toBe('MSL');
    // 3000 ft = 914.4 m (international foot); 2410 = from 240° at 10 kt = 5.14444 m/s, shown
    // to the speed rule's tenth (the plan keeps the exact value).
    await expect(
      page.locator('sf-wind-panel input[data-path="winds.layers[0].altitude_m"]').inputValue(),
    ).resolves.toBe('914.4');
    await expect(
      page.locator('sf-wind-panel input[data-path="winds.layers[0].speed_mps"]').inputValue(),
    ).resolves.toBe('5.1');
    await page.locator('[data-testid=planned]').waitFor({ timeout: 30_000 });
    await expect
      .poll(() => page.locator('[data-testid=wind-plot] path.sp').getAttribute('d'))
      .not.toBe(plotBefore);
    await shot(page, 'winds-bulletin');
    // The hodograph is drawn, and the altitude sweep runs in its own worker.
    expect(await page.locator('[data-testid=hodograph] svg').count()).toBe(1);
    await page.getByRole('button', { name: 'Compute' }).click();
    await page.locator('[data-testid=sweep] svg').waitFor({ timeout: 30_000 });
    expect(await page.locator('[data-testid=sweep] svg circle').count()).toBeGreaterThanOrEqual(9);
    await page.locator('[data-testid=sweep]').scrollIntoViewIfNeeded();
    await shot(page, 'winds-sweep');
    // The demo plan holds a second forecast 3.5 h later: the timeline covers both, per site.
    await page.getByRole('button', { name: 'Timeline' }).click();
    await page.locator('[data-testid=timeline] svg').waitFor({ timeout: 60_000 });
    const cells = await page.locator('[data-testid=timeline] svg rect').count();
    expect(cells).toBeGreaterThanOrEqual(12 * 10);
    expect(await page.locator('[data-testid=timeline] svg rect.ok').count()).toBeGreaterThan(0);
    await page.locator('[data-testid=timeline]').scrollIntoViewIfNeeded();
    await shot(page, 'winds-timeline');
    // One undo brings the previous profile back.
    await page.getByRole('button', { name: 'Undo' }).click();
    await expect.poll(() => page.locator('sf-wind-panel tr[data-layer]').count()).toBe(6);
    expect(errors).toEqual([]);
    await context.close();
  });

  it('shows the demo timeline in the plan zone with UTC, labels inside the drawing, and the CLI windows', async () => {
    const { context, page, errors } = await openApp(browser, inject('baseUrl'), {
      width: 1280,
      height: 900,
    });
    await page.locator('[data-tab=winds]').click();
    await page.getByRole('button', { name: 'Timeline' }).click();
    await page.locator('[data-testid=timeline-windows]').waitFor({ timeout: 90_000 });
    const svg = page.locator('[data-testid=timeline] svg');
    // The demo plan time is 2026-12-01T09:30:00+01:00: each local label is its UTC label + 1 h
    // (RFC 3339 §5.6 offset), the first at 09:30.
    const local = await svg.locator('text.t-local').allTextContents();
    const utc = await svg.locator('text.t-utc:not(.zone)').allTextContents();
    expect(local.length).toBeGreaterThanOrEqual(4);
    expect(utc.length).toBe(local.length);
    const min = (t: string): number => Number(t.slice(0, 2)) * 60 + Number(t.slice(3, 5));
    expect(local[0]).toBe('09:30');
    expect(local.at(-1)).toBe('13:00');
    local.forEach((l, i) => expect(min(l)).toBe(min(utc[i]) + 60));
    expect(await svg.locator('text.zone').allTextContents()).toEqual(['UTC+01:00', 'UTC']);
    // Every label, the last one included, lies inside the drawing as the browser lays it out.
    const outside = await svg.evaluate((el) => {
      const box = el.getBoundingClientRect();
      return [...el.querySelectorAll('text')]
        .map((t) => ({ text: t.textContent, r: t.getBoundingClientRect() }))
        .filter(({ r }) => r.left < box.left - 0.5 || r.right > box.right + 0.5)
        .map(({ text, r }) => `${text}: ${r.left}…${r.right} outside ${box.left}…${box.right}`);
    });
    expect(outside).toEqual([]);
    // Under it, each site's windows: the same clock times the CLI gives for the same plan.
    const v = validatePlan(structuredClone(demo));
    if (!v.ok) throw new Error('the demo plan must validate');
    const expected = timelineWindows(
      planTimeline(v.plan, { step_s: TIMELINE_STEP_S }),
      v.plan.requiredPHit,
      planZone(v.plan.time),
    ).sites.flatMap((s) =>
      s.windows.length === 0
        ? [`${s.id}|no evaluated time meets P(hit) ≥ 0.9`]
        : s.windows.map((w, i) => `${i === 0 ? s.id : ''}|${w.openText}|${w.closeText}`),
    );
    const shown = await page
      .locator('[data-testid=timeline-windows] tbody tr')
      .evaluateAll((rows) =>
        rows.map((r) =>
          [...r.querySelectorAll('td')]
            .slice(0, 3)
            .map((td) => td.textContent!.trim())
            .join('|'),
        ),
      );
    expect(shown).toEqual(expected);
    expect(shown.some((r) => r.includes('no evaluated time'))).toBe(true);
    await svg.scrollIntoViewIfNeeded();
    await shot(page, 'winds-timeline-zone');
    await page.locator('[data-testid=timeline-windows]').scrollIntoViewIfNeeded();
    await shot(page, 'winds-timeline-windows');
    // The brief opened now prints this timeline with the same window list.
    const [brief] = await Promise.all([
      context.waitForEvent('page'),
      page.getByRole('button', { name: 'Brief' }).click(),
    ]);
    await brief.waitForLoadState('load');
    const printed = await brief
      .locator('section.timeline-section table.windows tbody tr')
      .evaluateAll((rows) =>
        rows.map((r) =>
          [...r.querySelectorAll('td')]
            .slice(0, 3)
            .map((td) => td.textContent!.trim())
            .join('|'),
        ),
      );
    expect(printed).toEqual(expected);
    await brief.locator('section.timeline-section').scrollIntoViewIfNeeded();
    await shot(brief, 'winds-timeline-brief');
    expect(errors).toEqual([]);
    await context.close();
  });
});
