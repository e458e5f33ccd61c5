import { readFileSync } from 'node:fs';
import type { Browser, BrowserContext, Page } from 'playwright-core';
import { afterAll, afterEach, beforeAll, describe, expect, inject, it } from 'vitest';
import { launch, shot, watchErrors } from './browser';

// The rule under test (common practice for editors with autosave, and this project's product
// rule): saved work that cannot be read is reported and kept, never silently replaced; storage
// and worker failures are shown, never thrown or waited for.

const DRAFT_KEY = 'seedfall.draft.v1';
const DAMAGED_KEY = 'seedfall.draft.damaged.v1';
const SETTINGS_KEY = 'seedfall.settings.v1';
const TABS = ['results', 'safety', 'plan', 'winds', 'sites', 'variants', 'settings'] as const;
/** The element each tab shows, to know it rendered. */
const TAB_CONTENT: Record<(typeof TABS)[number], string> = {
  results: 'sf-results-table',
  safety: 'sf-safety-panel h3',
  plan: 'sf-plan-panel h3',
  winds: 'sf-wind-panel h3',
  sites: 'sf-sites-panel h3',
  variants: 'sf-variants-panel h3',
  settings: '[data-setting=length]',
};

/** A stored value: text as is, or `times` copies of `repeat` (made in the page, not sent). */
type Seed = string | { repeat: string; times: number };

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

/**
 * Opens the app on a browser profile whose storage holds `items` before the page's own script
 * runs (once: a reload finds what the app left). `fill` first fills storage to its quota.
 * IndexedDB writes fail as a full browser's do while `window.e2eFull` is true.
 */
async function openWith(
  items: Record<string, Seed>,
  opts: { fill?: boolean; block?: string } = {},
): Promise<void> {
  context = await browser.newContext({
    viewport: { width: 1280, height: 800 },
    acceptDownloads: true,
  });
  await context.addInitScript(
    ([seed, fill]) => {
      const put = IDBObjectStore.prototype.put;
      IDBObjectStore.prototype.put = function (
        this: IDBObjectStore,
        ...args: [unknown, IDBValidKey?]
      ) {
        if ((window as unknown as { e2eFull?: boolean }).e2eFull) {
          throw new DOMException('The quota has been exceeded.', 'QuotaExceededError');
        }
        return put.apply(this, args);
      };
      if (localStorage.getItem('e2e.seeded') !== null) return;
      localStorage.setItem('e2e.seeded', '1');
      for (const [k, v] of Object.entries(seed)) {
        localStorage.setItem(k, typeof v === 'string' ? v : v.repeat.repeat(v.times));
      }
      if (!fill) return;
      // Fill to the quota with ever smaller blocks until not even 16 characters fit.
      let n = 0;
      for (let size = 1 << 20; size >= 16; size >>= 2) {
        for (;;) {
          try {
            localStorage.setItem(`e2e.fill.${n++}`, 'f'.repeat(size));
          } catch {
            break;
          }
        }
      }
    },
    [items, opts.fill ?? false] as const,
  );
  page = await context.newPage();
  errors = watchErrors(page);
  if (opts.block) await context.route(`**/${opts.block}*.js`, (r) => r.abort());
  await page.goto(inject('baseUrl'));
  await page.locator('seedfall-app nav [data-tab=results]').waitFor({ timeout: 30_000 });
}

/** Opens every tab and checks each one shows its content. */
async function visitEveryTab(): Promise<void> {
  for (const t of TABS) {
    await page.locator(`[data-tab=${t}]`).click();
    await page.locator(TAB_CONTENT[t]).first().waitFor({ timeout: 10_000 });
  }
  await page.locator('[data-tab=results]').click();
}

const stored = (key: string) =>
  page.evaluate((k) => localStorage.getItem(k), key) as Promise<string | null>;

/**
 * The draft text autosave last wrote: the plan being edited in the plan library (IndexedDB
 * seedfall-library, app/ui/library-store.ts), which took over from the single draft key.
 */
const savedDraft = () =>
  page.evaluate(
    () =>
      new Promise<string | null>((resolve) => {
        const req = indexedDB.open('seedfall-library');
        req.onerror = () => resolve(null);
        req.onsuccess = () => {
          const db = req.result;
          if (!db.objectStoreNames.contains('meta')) {
            db.close();
            resolve(null);
            return;
          }
          const tx = db.transaction(['plans', 'meta']);
          const cur = tx.objectStore('meta').get('current');
          cur.onsuccess = () => {
            if (typeof cur.result !== 'string') return;
            const rec = tx.objectStore('plans').get(cur.result);
            rec.onsuccess = () =>
              resolve((rec.result as { draft?: string } | undefined)?.draft ?? null);
          };
          tx.oncomplete = () => {
            db.close();
            resolve(null);
          };
        };
      }),
  );

/** Changes the release altitude through its field (an edit that autosave writes). */
async function editAltitude(value: string): Promise<void> {
  await page.locator('[data-tab=plan]').click();
  const alt = page.locator('sf-plan-panel input[data-path="release.altitude_m"]');
  await alt.fill(value);
  await alt.press('Enter');
}

/** Waits until the stored draft's release altitude is `m` (autosave has run). */
async function savedAltitude(m: number): Promise<void> {
  await expect
    .poll(
      async () => {
        try {
          return (JSON.parse((await savedDraft()) ?? '{}') as { release?: { altitude_m?: number } })
            .release?.altitude_m;
        } catch {
          return undefined;
        }
      },
      { timeout: 15_000 },
    )
    .toBe(m);
}

/** Clicks the download button of the notice and returns the downloaded text. */
async function downloadDamaged(): Promise<string> {
  const [dl] = await Promise.all([
    page.waitForEvent('download'),
    page.locator('[data-testid=download-damaged]').click(),
  ]);
  const path = await dl.path();
  return readFileSync(path, 'utf8');
}

describe('a damaged saved draft', () => {
  const cases: [string, string, RegExp][] = [
    ['text that is not JSON', 'not json {', /it is not JSON/],
    ['a bare JSON string', '"a bare string"', /it holds a piece of text, not a plan/],
    ['a JSON list', '[]', /it holds a list, not a plan/],
  ];
  for (const [what, text, reason] of cases) {
    it(`(${what}) is kept under its own key, named in a notice, downloadable, and every tab works`, async () => {
      await openWith({ [DRAFT_KEY]: text });
      const notice = page.locator('[data-testid=damaged-draft]');
      await expect(notice.innerText()).resolves.toMatch(/Your saved draft could not be read/);
      await expect(notice.innerText()).resolves.toMatch(reason);
      await expect(notice.innerText()).resolves.toContain(
        `kept unchanged in browser storage under ${DAMAGED_KEY}`,
      );
      await page.locator('[data-testid=planned]').waitFor({ timeout: 30_000 });
      expect(await stored(DAMAGED_KEY)).toBe(text);
      await visitEveryTab();
      // Autosave may now write (into the plan library): the copy stays as it was.
      await editAltitude('96');
      await savedAltitude(96);
      expect(await stored(DAMAGED_KEY)).toBe(text);
      expect(await downloadDamaged()).toBe(text);
      // The copy is shown again on the next visit until it is deleted.
      await page.reload();
      await expect(notice.innerText()).resolves.toMatch(/still kept in browser storage/);
      await page.locator('[data-testid=delete-damaged]').click();
      await expect.poll(() => notice.count()).toBe(0);
      expect(await stored(DAMAGED_KEY)).toBeNull();
      expect(errors).toEqual([]);
    });
  }

  it('(4.5 MB of junk) that storage cannot copy is held: autosave waits until it is downloaded and discarded', async () => {
    const junk = { repeat: 'x7#', times: 1_500_000 };
    const text = junk.repeat.repeat(junk.times);
    await openWith({ [DRAFT_KEY]: junk });
    const notice = page.locator('[data-testid=damaged-draft]');
    // Chromium holds 10 MB of UTF-16 per origin (from memory): no room for a second 4.5 MB copy.
    await expect(notice.innerText()).resolves.toMatch(/it is not JSON/);
    await expect(notice.innerText()).resolves.toMatch(/autosave is paused/);
    await shot(page, 'drafts-damaged-held');
    await visitEveryTab();
    await editAltitude('97');
    // Autosave runs 200 ms after an edit and on page hide; neither may touch the damaged draft.
    await page.waitForTimeout(1000);
    await page.evaluate(() => window.dispatchEvent(new Event('pagehide')));
    expect((await stored(DRAFT_KEY)) === text).toBe(true);
    expect((await downloadDamaged()) === text).toBe(true);
    await page.locator('[data-testid=dismiss-damaged]').click();
    await savedAltitude(97);
    expect(errors).toEqual([]);
  });
});

describe('a saved draft of the wrong shape', () => {
  it('opens like a file with problems: every tab renders and the problems are listed', async () => {
    const wrong = {
      name: 3,
      time: '2026-12-01T09:30:00Z',
      sites: 5,
      variants: {},
      winds: null,
      release: 'r',
      carrier: [],
      safety: { noDropZones: 'x', checklist: 7 },
    };
    await openWith({ [DRAFT_KEY]: JSON.stringify(wrong) });
    await visitEveryTab();
    const problems = page.locator('ul.issues').first();
    await expect(problems.innerText()).resolves.toMatch(/sites/);
    await expect(problems.innerText()).resolves.toMatch(/variants/);
    await expect(page.locator('[data-testid=no-result]').innerText()).resolves.toMatch(
      /problems to fix/,
    );
    await expect(page.locator('[data-testid=stale]').innerText()).resolves.toMatch(/problems? in/);
    // Nothing was replaced: the draft moved into the plan library as it was stored.
    await expect
      .poll(async () => JSON.parse((await savedDraft()) ?? '{}') as unknown, { timeout: 30_000 })
      .toMatchObject({ sites: 5, name: 3 });
    await expect.poll(() => stored(DRAFT_KEY), { timeout: 30_000 }).toBeNull();
    await shot(page, 'drafts-wrong-shape');
    expect(errors).toEqual([]);
  });

  it('with entries of the wrong kind inside lists: every tab renders', async () => {
    const demo = JSON.parse(readFileSync('data/demo-plan.json', 'utf8')) as Record<string, unknown>;
    const draft = {
      ...demo,
      sites: [null, 7, 'x', ...(demo.sites as unknown[]).slice(0, 2)],
      variants: [null, [1], ...(demo.variants as unknown[])],
      winds: { layers: [null, 4], forecasts: 9 },
      safety: {
        noDropZones: [null, { geometry: 5 }, { geometry: { coordinates: [[['a', 1]]] } }],
        checklist: [null, 5, { id: 'own', text: 'kept item', state: 'open' }],
      },
    };
    await openWith({ [DRAFT_KEY]: JSON.stringify(draft) });
    await visitEveryTab();
    await page.locator('[data-tab=safety]').click();
    await expect(
      page.locator('sf-safety-panel [data-item=own] input.text').inputValue(),
    ).resolves.toBe('kept item');
    await page.locator('[data-tab=sites]').click();
    await expect(page.locator('sf-sites-panel tbody tr').count()).resolves.toBe(5);
    expect(errors).toEqual([]);
  });
});

describe('damaged settings', () => {
  const cases: [string, string, RegExp][] = [
    [
      'fields of the wrong type',
      '{"units": 5, "tileUrl": []}',
      /units must be an object.*tileUrl must be text/,
    ],
    [
      'unit values not in the lists',
      '{"units": {"length": 5, "coords": 7}}',
      /units\.length 5 is not one of m, ft/,
    ],
    ['text that is not JSON', 'nope', /settings are not JSON/],
  ];
  for (const [what, text, message] of cases) {
    it(`(${what}) fall back to the defaults with a notice, and every tab works`, async () => {
      await openWith({ [SETTINGS_KEY]: text });
      await expect(page.locator('[data-testid=notice]').innerText()).resolves.toMatch(message);
      await visitEveryTab();
      await page.locator('[data-tab=sites]').click();
      await expect(page.locator('sf-sites-panel th').nth(2).innerText()).resolves.toBe(
        'Position (lat, lon)',
      );
      expect(errors).toEqual([]);
    });
  }
});

describe('browser storage full', () => {
  it('autosave failure is shown and kept until a save works; the edit stays in the page', async () => {
    // Autosave writes into the plan library (IndexedDB) since it took over from the single draft
    // key: both storages are full here (localStorage filled, IndexedDB writes refused).
    await openWith({}, { fill: true });
    await page.locator('[data-testid=planned]').waitFor({ timeout: 30_000 });
    await expect.poll(savedDraft, { timeout: 30_000 }).not.toBeNull();
    await page.evaluate(() => ((window as unknown as { e2eFull: boolean }).e2eFull = true));
    await editAltitude('94');
    const alert = page.locator('[data-testid=save-error]');
    await expect(alert.innerText()).resolves.toBe(
      'Autosave failed: browser storage is full — save the plan to a file (Save) to keep your edits.',
    );
    await expect(
      page.locator('sf-plan-panel input[data-path="release.altitude_m"]').inputValue(),
    ).resolves.toBe('94');
    await shot(page, 'drafts-storage-full');
    // Make room: the next autosave works and the alert goes.
    await page.evaluate(() => {
      for (const k of Object.keys(localStorage))
        if (k.startsWith('e2e.fill.')) localStorage.removeItem(k);
      (window as unknown as { e2eFull: boolean }).e2eFull = false;
    });
    await editAltitude('93');
    await savedAltitude(93);
    await expect.poll(() => alert.count(), { timeout: 10_000 }).toBe(0);
    await page.reload();
    await page.locator('[data-tab=plan]').click();
    await expect
      .poll(
        () => page.locator('sf-plan-panel input[data-path="release.altitude_m"]').inputValue(),
        { timeout: 30_000 },
      )
      .toBe('93');
    expect(errors).toEqual([]);
  });
});

describe('workers that cannot start', () => {
  // The browser's own console report of the request the test blocks.
  const BLOCKED = /net::ERR_FAILED|Failed to load resource/;

  it('the planning worker: the failure is shown instead of "Planning…" for ever', async () => {
    await openWith({}, { block: 'plan-worker' });
    await page
      .getByText('Planning failed: the planning worker could not start')
      .waitFor({ timeout: 30_000 });
    await expect(page.locator('[data-testid=computing]').count()).resolves.toBe(0);
    await expect(page.locator('[data-testid=no-result]').innerText()).resolves.toMatch(
      /planning failed/,
    );
    // An edit does not start waiting again.
    await editAltitude('95');
    await expect(page.locator('[data-testid=computing]').count()).resolves.toBe(0);
    await visitEveryTab();
    expect(errors.filter((e) => !BLOCKED.test(e))).toEqual([]);
  });

  it('the sweep worker: the failure is shown and the button can be used again', async () => {
    await openWith({}, { block: 'sweep-worker' });
    await page.locator('[data-testid=planned]').waitFor({ timeout: 30_000 });
    await page.locator('[data-tab=winds]').click();
    const button = page.locator('sf-wind-sources').getByRole('button', { name: /^Comput/ });
    await button.click();
    await expect(page.locator('[data-testid=sweep-error]').innerText()).resolves.toMatch(
      /could not run: its worker could not start/,
    );
    await expect(button.innerText()).resolves.toMatch(/^\s*Compute\s*$/);
    await expect(button.isEnabled()).resolves.toBe(true);
    await shot(page, 'drafts-sweep-blocked');
    expect(errors.filter((e) => !BLOCKED.test(e))).toEqual([]);
  });
});
