// The side panel at the two common laptop screen sizes: every tab of the demo plan fits the
// panel's width (nothing cut off at the right edge, no sideways scrolling), and no style changes
// the case of a symbol (σ, the standard deviation, must not turn into Σ, a sum).
import { readFileSync } from 'node:fs';
import type { Browser, BrowserContext, Page } from 'playwright-core';
import { afterAll, afterEach, beforeAll, describe, expect, inject, it } from 'vitest';
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

const TABS = ['results', 'safety', 'plan', 'winds', 'sites', 'variants', 'settings'] as const;

// common practice: 1280×800 and 1440×900 are the usual laptop screens a crew plans on.
const SIZES = [
  { width: 1280, height: 800 },
  { width: 1440, height: 900 },
];

/** What the panel check found: overflowing controls, sideways scrolling, case-changed text. */
interface Layout {
  panelRight: number;
  scrollWidth: number;
  clientWidth: number;
  /** Visible controls or cells whose right edge lies past the panel's (by more than 1 px). */
  cut: string[];
  /** Elements inside the panel that scroll sideways (their content is wider than they are). */
  scrollers: string[];
  /** Number inputs whose value is wider than the input (a cramped field hides digits). */
  cramped: string[];
  /** Elements whose source text has σ but whose rendered text shows Σ. */
  recased: string[];
  /** Text of every heading, as rendered. */
  headings: string[];
}

/** Walks the open tab's panel through every shadow root and measures it. */
async function measure(page: Page): Promise<Layout> {
  return page.evaluate(() => {
    const app = document.querySelector('seedfall-app')!;
    const panel = app.shadowRoot!.querySelector('.panel') as HTMLElement;
    const pr = panel.getBoundingClientRect();
    // The right edge of the panel's content: inside its padding, left of a vertical scroll bar.
    const padRight = parseFloat(getComputedStyle(panel).paddingRight) || 0;
    const panelRight = pr.left + panel.clientLeft + panel.clientWidth - padRight;
    const all: Element[] = [];
    const walk = (root: Element | ShadowRoot): void => {
      for (const el of Array.from(root.children)) {
        all.push(el);
        if (el.shadowRoot) walk(el.shadowRoot);
        walk(el);
      }
    };
    walk(panel);
    const name = (el: Element): string => {
      const h = el as HTMLElement;
      const path = h.getAttribute('data-path') ?? h.getAttribute('aria-label') ?? '';
      const text = (h.innerText ?? h.textContent ?? '').trim().slice(0, 40);
      return `${el.tagName.toLowerCase()}${path ? `[${path}]` : ''} "${text}"`;
    };
    const visible = (el: Element): boolean => {
      const r = el.getBoundingClientRect();
      const cs = getComputedStyle(el);
      return r.width > 0 && r.height > 0 && cs.visibility !== 'hidden' && cs.display !== 'none';
    };
    const cut: string[] = [];
    const scrollers: string[] = [];
    const cramped: string[] = [];
    const recased: string[] = [];
    const headings: string[] = [];
    for (const el of all) {
      const tag = el.tagName.toLowerCase();
      if (!visible(el)) continue;
      const r = el.getBoundingClientRect();
      if (['input', 'button', 'select', 'textarea', 'td', 'th', 'label'].includes(tag)) {
        if (r.right > panelRight + 1) cut.push(`${name(el)} right ${Math.round(r.right)}`);
      }
      const cs = getComputedStyle(el);
      if (
        !['input', 'textarea', 'select'].includes(tag) &&
        ['auto', 'scroll'].includes(cs.overflowX) &&
        el.scrollWidth > el.clientWidth + 1
      ) {
        scrollers.push(`${name(el)} ${el.scrollWidth} > ${el.clientWidth}`);
      }
      if (tag === 'input' && (el as HTMLInputElement).type !== 'file') {
        const inp = el as HTMLInputElement;
        if (inp.value && inp.scrollWidth > inp.clientWidth + 1) {
          cramped.push(`${name(el)} "${inp.value}" ${inp.scrollWidth} > ${inp.clientWidth}`);
        }
      }
      if (/^h[1-6]$/.test(tag)) headings.push((el as HTMLElement).innerText);
      const h = el as HTMLElement;
      if ((h.textContent ?? '').includes('σ') && (h.innerText ?? '').includes('Σ')) {
        recased.push(name(el));
      }
    }
    return {
      panelRight,
      scrollWidth: panel.scrollWidth,
      clientWidth: panel.clientWidth,
      cut,
      scrollers,
      cramped,
      recased,
      headings,
    };
  });
}

/**
 * Screenshots of the whole open tab: one per panel height, scrolled down in turn (a person looks
 * at the lower parts too), then back to the top.
 */
async function shotWholePanel(page: Page, name: string): Promise<void> {
  const panel = page.locator('seedfall-app .panel');
  const { scrollHeight, clientHeight } = await panel.evaluate((p) => ({
    scrollHeight: p.scrollHeight,
    clientHeight: p.clientHeight,
  }));
  const step = Math.max(1, clientHeight - 40);
  const parts = Math.min(6, 1 + Math.ceil(Math.max(0, scrollHeight - clientHeight) / step));
  for (let i = 0; i < parts; i++) {
    await panel.evaluate((p, top) => p.scrollTo(0, top), i * step);
    await shot(page, parts > 1 ? `${name}-${i + 1}` : name);
  }
  await panel.evaluate((p) => p.scrollTo(0, 0));
}

/** The plan as the Save button writes it. */
async function savedPlan(page: Page): Promise<unknown> {
  const [download] = await Promise.all([
    page.waitForEvent('download'),
    page.getByRole('button', { name: 'Save' }).click(),
  ]);
  return JSON.parse(readFileSync(await download.path(), 'utf8'));
}

describe('side panel layout', () => {
  for (const size of SIZES) {
    it(`every tab fits the panel at ${size.width}×${size.height}`, async () => {
      let page: Page;
      let errors: string[];
      ({ context, page, errors } = await openApp(browser, inject('baseUrl'), size));
      for (const tab of TABS) {
        await page.locator(`[data-tab=${tab}]`).click();
        await expect
          .poll(() => page.locator('[role=tab][aria-selected=true]').getAttribute('data-tab'))
          .toBe(tab);
        // Wait for the tab's content (its first heading or table) before measuring.
        await page
          .locator('seedfall-app .panel')
          .locator('h3, table, .settings')
          .first()
          .waitFor({ timeout: 30_000 });
        await shotWholePanel(page, `layout-${size.width}x${size.height}-${tab}`);
        const m = await measure(page);
        expect.soft(m.cut, `${tab}: cut off at the panel's right edge ${m.panelRight}`).toEqual([]);
        expect
          .soft(m.scrollWidth, `${tab}: the panel scrolls sideways`)
          .toBeLessThanOrEqual(m.clientWidth);
        expect.soft(m.scrollers, `${tab}: sideways scrolling inside the panel`).toEqual([]);
        expect.soft(m.cramped, `${tab}: values wider than their inputs`).toEqual([]);
        expect.soft(m.recased, `${tab}: σ shown as Σ`).toEqual([]);
        if (tab === 'plan') {
          // The heading's source text is "Uncertainty (1σ)"; as shown it must still read σ.
          const u = m.headings.find((h) => h.toLowerCase().startsWith('uncertainty'));
          expect(u).toBeDefined();
          expect(u).toContain('σ');
          expect(u).not.toContain('Σ');
        }
      }
      expect(errors).toEqual([]);
    });
  }

  it('a site row or wind layer with bad values keeps its fields and messages inside the panel', async () => {
    let page: Page;
    let errors: string[];
    ({ context, page, errors } = await openApp(browser, inject('baseUrl'), SIZES[0]));
    await page.locator('[data-tab=sites]').click();
    const lat = page.locator('input[data-path="sites[0].lat"]');
    await lat.fill('95');
    await lat.press('Enter');
    const tol = page.locator('input[data-path="sites[0].tolerance_m"]');
    await tol.fill('12,5');
    await tol.press('Enter');
    // The row's messages sit on a full-width line of their own, each naming its field.
    const msgs = page.locator('sf-sites-panel tr[data-site-row=s01] .c-msg');
    await expect.poll(() => msgs.locator('.field-error').count()).toBe(2);
    await expect(msgs.innerText()).resolves.toContain('sites[0].lat must be between -90 and 90');
    await expect(msgs.innerText()).resolves.toContain('sites[0].tolerance_m');
    // The text typed is kept as typed.
    await expect(tol.inputValue()).resolves.toBe('12,5');
    await shotWholePanel(page, 'layout-1280x800-sites-bad-values');
    const m = await measure(page);
    expect.soft(m.cut, `cut off at the panel's right edge ${m.panelRight}`).toEqual([]);
    expect.soft(m.scrollWidth, 'the panel scrolls sideways').toBeLessThanOrEqual(m.clientWidth);
    expect.soft(m.scrollers, 'sideways scrolling inside the panel').toEqual([]);
    await page.locator('[data-tab=winds]').click();
    const speed = page.locator('input[data-path="winds.layers[0].speed_mps"]');
    await speed.fill('-3');
    await speed.press('Enter');
    await expect
      .poll(() => page.locator('sf-wind-panel tr.msg').innerText())
      .toContain('winds.layers[0].speed_mps');
    await shot(page, 'layout-1280x800-winds-bad-value');
    const w = await measure(page);
    expect.soft(w.cut, `winds: cut off at the panel's right edge ${w.panelRight}`).toEqual([]);
    expect
      .soft(w.scrollWidth, 'winds: the panel scrolls sideways')
      .toBeLessThanOrEqual(w.clientWidth);
    await expect(speed.inputValue()).resolves.toBe('-3');
    expect(errors).toEqual([]);
  });

  it('shows converted values rounded, and a unit round trip leaves the plan as it was', async () => {
    let page: Page;
    let errors: string[];
    ({ context, page, errors } = await openApp(browser, inject('baseUrl')));
    const before = await savedPlan(page);
    const units = async (length: string, speed: string): Promise<void> => {
      await page.locator('[data-tab=settings]').click();
      await page.locator('select[data-setting=length]').selectOption(length);
      await page.locator('select[data-setting=speed]').selectOption(speed);
    };
    const field = (path: string) => page.locator(`input[data-path="${path}"]`);
    await units('ft', 'kt');
    await page.locator('[data-tab=plan]').click();
    // Worked by hand with NIST SP 811 B.8 (foot 0.3048 m, knot 1852/3600 m/s): 110 m =
    // 360.892 ft, 300 m = 984.252 ft, 0.7 m/s = 1.36069 kt, 13 m/s = 25.2700 kt, 3 m = 9.84252 ft.
    await expect.poll(() => field('release.altitude_m').inputValue()).toBe('361');
    await expect(field('uncertainty.windCorrelation_m').inputValue()).resolves.toBe('984');
    await expect(field('uncertainty.windSpeed_mps').inputValue()).resolves.toBe('1.4');
    await expect(field('carrier.groundSpeed_mps').inputValue()).resolves.toBe('25.3');
    await expect(field('uncertainty.releasePosition_m').inputValue()).resolves.toBe('9.8');
    // Focusing a rounded field and leaving it without typing writes nothing back.
    await field('release.altitude_m').focus();
    await page.keyboard.press('Tab');
    // Site s01's tolerance 10 m = 32.808 4 ft; ground 89.4 m = 293.307 ft.
    await page.locator('[data-tab=sites]').click();
    await expect(field('sites[0].tolerance_m').inputValue()).resolves.toBe('32.8');
    await expect(field('sites[0].elevation_m').inputValue()).resolves.toBe('293');
    await page.locator('[data-tab=winds]').click();
    await page.locator('[data-tab=variants]').click();
    await page.locator('[data-tab=safety]').click();
    await units('m', 'km/h');
    await units('m', 'm/s');
    await page.locator('[data-tab=plan]').click();
    await expect.poll(() => field('release.altitude_m').inputValue()).toBe('110');
    await expect(field('uncertainty.windSpeed_mps').inputValue()).resolves.toBe('0.7');
    await expect(page.getByRole('button', { name: 'Undo' }).isDisabled()).resolves.toBe(true);
    expect(await savedPlan(page)).toEqual(before);
    // An edit typed in feet is stored in metres: 362 ft = 110.3376 m.
    await units('ft', 'kt');
    await page.locator('[data-tab=plan]').click();
    await field('release.altitude_m').fill('362');
    await field('release.altitude_m').press('Enter');
    await expect
      .poll(async () => ((await savedPlan(page)) as { release: { altitude_m: number } }).release)
      .toMatchObject({ altitude_m: 362 * 0.3048 });
    expect(errors).toEqual([]);
  });
});
