import { readFileSync } from 'node:fs';
import type { Browser, BrowserContext, Page } from 'playwright-core';
import { afterAll, afterEach, beforeAll, describe, expect, inject, it } from 'vitest';
import { validatePlan } from '../../app/plan';
import { launch, shot, watchErrors } from './browser';

// The plan library (app/ui/library-store.ts, library-link.ts, plan-library.ts). The rules under
// test are this project's product rules and common practice for editors with autosave: saved work
// survives a reload, moves once into a new store without being lost, and stored data that cannot
// be read is reported and kept, never silently replaced.

const DRAFT_KEY = 'seedfall.draft.v1';
const demo = JSON.parse(readFileSync('data/demo-plan.json', 'utf8')) as Record<string, unknown>;

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

/** What the library holds, read in the page (IndexedDB seedfall-library). */
interface Held {
  current: string | null;
  plans: { id: string; name: unknown; altitude?: number; draft: unknown }[];
}

const held = (): Promise<Held> =>
  page.evaluate(
    () =>
      new Promise<Held>((resolve, reject) => {
        const req = indexedDB.open('seedfall-library');
        req.onerror = () => reject(req.error);
        req.onsuccess = () => {
          const db = req.result;
          if (!db.objectStoreNames.contains('plans')) {
            db.close();
            resolve({ current: null, plans: [] });
            return;
          }
          const tx = db.transaction(['plans', 'meta']);
          const all = tx.objectStore('plans').getAll();
          const cur = tx.objectStore('meta').get('current');
          tx.oncomplete = () => {
            db.close();
            const plans = (all.result as { id: string; name: unknown; draft: unknown }[]).map(
              (p) => {
                let altitude: number | undefined;
                try {
                  altitude = (JSON.parse(String(p.draft)) as { release: { altitude_m: number } })
                    .release.altitude_m;
                } catch {
                  altitude = undefined;
                }
                return { id: p.id, name: p.name, draft: p.draft, altitude };
              },
            );
            resolve({ current: (cur.result as string | undefined) ?? null, plans });
          };
        };
      }),
  );

/** Writes records into the library's stores (as a damaged or hand-edited entry would be found). */
const put = (store: 'plans' | 'meta', value: unknown, key?: string) =>
  page.evaluate(
    ([s, v, k]) =>
      new Promise<void>((resolve, reject) => {
        const req = indexedDB.open('seedfall-library');
        req.onerror = () => reject(req.error);
        req.onsuccess = () => {
          const db = req.result;
          const tx = db.transaction(s, 'readwrite');
          if (k === undefined) tx.objectStore(s).put(v);
          else tx.objectStore(s).put(v, k);
          tx.oncomplete = () => {
            db.close();
            resolve();
          };
          tx.onerror = () => reject(tx.error);
        };
      }),
    [store, value, key] as const,
  );

/** A fresh profile on the app; init runs in every page before the app's own script. */
async function start(init?: () => void): Promise<void> {
  context = await browser.newContext({
    viewport: { width: 1280, height: 800 },
    acceptDownloads: true,
  });
  if (init) await context.addInitScript(init);
  page = await context.newPage();
  errors = watchErrors(page);
  await page.goto(inject('baseUrl'));
  await ready();
}

/** The app has planned and its library is open (a plan is current). */
async function ready(): Promise<void> {
  await page.locator('[data-testid=planned]').waitFor({ timeout: 60_000 });
  await expect.poll(async () => (await held()).current, { timeout: 30_000 }).not.toBeNull();
}

const altitudeField = () => page.locator('sf-plan-panel input[data-path="release.altitude_m"]');

async function editAltitude(value: string): Promise<void> {
  await page.locator('[data-tab=plan]').click();
  await altitudeField().fill(value);
  await altitudeField().press('Enter');
}

/** Waits until the current plan's stored altitude is m (autosave has written it). */
async function savedAltitude(m: number): Promise<void> {
  await expect
    .poll(
      async () => {
        const h = await held();
        return h.plans.find((p) => p.id === h.current)?.altitude;
      },
      { timeout: 30_000 },
    )
    .toBe(m);
}

async function shownAltitude(): Promise<string> {
  await page.locator('[data-tab=plan]').click();
  return altitudeField().inputValue();
}

const view = () => page.locator('sf-plan-library dialog');
const row = (name: string) =>
  view()
    .locator('tbody tr')
    .filter({ has: page.locator('[data-testid=plan-name]', { hasText: name }) });

async function openView(): Promise<void> {
  await page.locator('[data-testid=open-library]').click();
  await view().waitFor({ state: 'visible', timeout: 10_000 });
}

/** The names listed, newest change first. */
const names = async (): Promise<string[]> =>
  (await view().locator('[data-testid=plan-name]').allInnerTexts()).map((t) =>
    t.replace(/\s*open$/, '').trim(),
  );

describe('the plan library', () => {
  it('keeps two plans across reloads, each with its own edits', async () => {
    await start();
    await editAltitude('96');
    await savedAltitude(96);
    await openView();
    await expect.poll(names).toEqual(['Varla oxbow wetland sensor drop']);
    await row('Varla').locator('[data-testid=duplicate-plan]').click();
    await expect.poll(names).toHaveLength(2);
    await row('(copy)').locator('[data-testid=open-plan]').click();
    await view().waitFor({ state: 'hidden', timeout: 10_000 });
    await expect(shownAltitude()).resolves.toBe('96'); // the copy holds the original's edit
    await expect(page.locator('header .plan-name').innerText()).resolves.toBe(
      'Varla oxbow wetland sensor drop (copy)',
    );
    await editAltitude('97');
    await savedAltitude(97);

    await page.reload();
    await ready();
    await expect.poll(shownAltitude, { timeout: 30_000 }).toBe('97');
    await openView();
    await expect(row('(copy)').locator('.tag').innerText()).resolves.toBe('open');
    await shot(page, 'library-two-plans');
    await row('Varla oxbow wetland sensor drop')
      .filter({ hasNotText: '(copy)' })
      .locator('[data-testid=open-plan]')
      .click();
    await expect.poll(shownAltitude, { timeout: 30_000 }).toBe('96');
    await page.reload();
    await ready();
    await expect.poll(shownAltitude, { timeout: 30_000 }).toBe('96');
    const h = await held();
    expect(h.plans.map((p) => p.altitude).sort()).toEqual([96, 97]);
    expect(errors).toEqual([]);
  });

  it('duplicates, renames with the name checked and shown as text, deletes with Undo', async () => {
    await start();
    await openView();
    await row('Varla').locator('[data-testid=duplicate-plan]').click();
    await expect.poll(names).toHaveLength(2);
    const copy = row('(copy)');
    await copy.locator('[data-testid=rename-plan]').click();
    const input = view().locator('[data-testid=rename-input]');
    await input.fill('   ');
    await view().locator('[data-testid=rename-save]').click();
    await expect(view().locator('[data-testid=rename-error]').innerText()).resolves.toMatch(
      /empty: give the plan a name of 1 to 200 characters/,
    );
    await input.fill('x'.repeat(201));
    await view().locator('[data-testid=rename-save]').click();
    await expect(view().locator('[data-testid=rename-error]').innerText()).resolves.toBe(
      'The name is 201 characters long; a plan name has 1 to 200.',
    );
    const markup = 'Field <b>B</b> & <img src=x onerror=alert(1)>';
    await input.fill(markup);
    await input.press('Enter');
    await expect.poll(names).toContain(markup);
    expect(await view().locator('tbody b, tbody img').count()).toBe(0);
    await shot(page, 'library-renamed');

    // The plan being edited cannot be deleted; another one can, and comes back with Undo.
    await expect(row('Varla').locator('[data-testid=delete-plan]').isDisabled()).resolves.toBe(
      true,
    );
    await row('Field').locator('[data-testid=delete-plan]').click();
    await expect.poll(names).toEqual(['Varla oxbow wetland sensor drop']);
    await expect(view().locator('[data-testid=library-trash]').innerText()).resolves.toContain(
      `Deleted “${markup}”.`,
    );
    await expect.poll(async () => (await held()).plans.length).toBe(1);
    await shot(page, 'library-deleted');
    await view().locator('[data-testid=undo-delete]').click();
    await expect
      .poll(async () => (await names()).sort())
      .toEqual([markup, 'Varla oxbow wetland sensor drop'].sort());
    await expect.poll(async () => (await held()).plans.length).toBe(2);

    // Renaming the open plan renames the plan itself (its title, its file when saved).
    await row('Varla').locator('[data-testid=rename-plan]').click();
    await input.fill('Field day A');
    await input.press('Enter');
    await expect.poll(names).toContain('Field day A');
    await expect(page.locator('header .plan-name').innerText()).resolves.toBe('Field day A');
    expect(errors).toEqual([]);
  });

  it('holds at most 200 plans and says so when asked for more', async () => {
    await start();
    const id = (await held()).current!;
    const rec = (await held()).plans.find((p) => p.id === id)!;
    // 199 more copies of the open plan: 200 in all.
    await page.evaluate(
      (r) =>
        new Promise<void>((resolve, reject) => {
          const req = indexedDB.open('seedfall-library');
          req.onerror = () => reject(req.error);
          req.onsuccess = () => {
            const db = req.result;
            const tx = db.transaction('plans', 'readwrite');
            for (let i = 1; i < 200; i++) {
              tx.objectStore('plans').put({
                id: `filler-${i}`,
                name: `Filler ${i}`,
                updatedAt: '2026-01-01T00:00:00Z',
                draft: r.draft,
                bytes: 10,
                baseMaps: [],
              });
            }
            tx.oncomplete = () => {
              db.close();
              resolve();
            };
            tx.onerror = () => reject(tx.error);
          };
        }),
      rec as { draft: string },
    );
    await openView();
    await expect.poll(async () => (await names()).length).toBe(200);
    await row('Filler 199').locator('[data-testid=duplicate-plan]').click();
    await expect
      .poll(() => view().locator('[data-testid=library-message]').innerText())
      .toBe(
        'Duplicate failed: The library holds 200 plans, its limit: export plans you no longer need and delete them to make room.',
      );
    await view()
      .locator('[data-testid=import-file]')
      .setInputFiles({
        name: 'one-more.json',
        mimeType: 'application/json',
        buffer: Buffer.from(JSON.stringify(demo)),
      });
    await expect
      .poll(() => view().locator('[data-testid=library-message]').innerText())
      .toMatch(/^Import failed: The library holds 200 plans, its limit/);
    expect((await held()).plans).toHaveLength(200);
    expect(errors).toEqual([]);
  });

  it('imports a plan file, refuses one that does not validate, and exports a plan that validates', async () => {
    await start();
    await openView();
    const file = view().locator('[data-testid=import-file]');
    await file.setInputFiles({
      name: 'trial.json',
      mimeType: 'application/json',
      buffer: Buffer.from(JSON.stringify({ ...demo, name: 'Imported trial' })),
    });
    await expect.poll(names).toContain('Imported trial');
    await file.setInputFiles({
      name: 'broken.json',
      mimeType: 'application/json',
      buffer: Buffer.from('{"name": '),
    });
    await expect
      .poll(() => view().locator('[data-testid=library-message]').innerText())
      .toMatch(/^broken\.json was not imported: it is not JSON/);
    await file.setInputFiles({
      name: 'wrong.json',
      mimeType: 'application/json',
      buffer: Buffer.from(
        JSON.stringify({ ...demo, release: { ...(demo.release as object), altitude_m: -5 } }),
      ),
    });
    await expect
      .poll(() => view().locator('[data-testid=library-message]').innerText())
      .toMatch(/^wrong\.json was not imported: .*release\.altitude_m/);
    expect(await names()).toHaveLength(2);

    const [dl] = await Promise.all([
      page.waitForEvent('download'),
      row('Imported trial').locator('[data-testid=export-plan]').click(),
    ]);
    expect(dl.suggestedFilename()).toBe('Imported-trial.json');
    const text = readFileSync(await dl.path(), 'utf8');
    const v = validatePlan(JSON.parse(text));
    expect(v.ok).toBe(true);
    expect(JSON.parse(text)).toEqual({ ...demo, name: 'Imported trial' });
    expect(errors).toEqual([]);
  });

  it('reports a damaged entry and keeps it, at open and at start', async () => {
    await start();
    const good = (await held()).current;
    await put('plans', {
      id: 'damaged-1',
      name: 'Broken <i>entry</i>',
      updatedAt: '2026-11-30T10:00:00Z',
      draft: '{"name": "cut off',
      bytes: 17,
      baseMaps: [],
    });
    await openView();
    await row('Broken').locator('[data-testid=open-plan]').click();
    await expect
      .poll(() => view().locator('[data-testid=library-message]').innerText())
      .toMatch(
        /^The plan “Broken <i>entry<\/i>” could not be opened: it is not JSON .*kept in the library/,
      );
    expect((await held()).current).toBe(good);
    await shot(page, 'library-damaged');

    // Made current by hand: the next start reports it, keeps it, and begins a new plan.
    await put('meta', 'damaged-1', 'current');
    await page.reload();
    await page.locator('[data-testid=planned]').waitFor({ timeout: 60_000 });
    await expect
      .poll(() => page.locator('[data-testid=notice]').innerText(), { timeout: 30_000 })
      .toMatch(/could not be opened: it is not JSON.*kept there as it is/);
    await expect.poll(async () => (await held()).current).not.toBe('damaged-1');
    const h = await held();
    expect(h.plans.find((p) => p.id === 'damaged-1')?.draft).toBe('{"name": "cut off');
    expect(h.plans).toHaveLength(3);
    expect(errors).toEqual([]);
  });

  it('warns in the status line when storage is past 80 % of its quota', async () => {
    await start(() => {
      // 95 MB of 100 MB used: 95 % full, 5.0 MB left (worked by hand).
      Object.defineProperty(navigator.storage, 'estimate', {
        value: () => Promise.resolve({ usage: 95_000_000, quota: 100_000_000 }),
      });
    });
    await expect
      .poll(() => page.locator('[data-testid=quota-warning]').innerText(), { timeout: 30_000 })
      .toBe(
        'Browser storage is 95 % full: 5.0 MB left of 100.0 MB. Export plans you no longer need and delete them (Plans).',
      );
    await shot(page, 'library-quota-warning');
    expect(errors).toEqual([]);
  });
});

describe('edits the library does not hold yet', () => {
  it('are kept when the page is hidden, come back on the next start, and block a switch of plan', async () => {
    await start(() => {
      // IndexedDB writes fail as a full browser's do while window.e2eFull is true (this page only).
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
    });
    await openView();
    await row('Varla').locator('[data-testid=duplicate-plan]').click();
    await expect.poll(names).toHaveLength(2);
    await view().locator('[data-testid=close-library]').click();
    await page.evaluate(() => ((window as unknown as { e2eFull: boolean }).e2eFull = true));
    await editAltitude('131');
    await page.locator('[data-testid=save-error]').waitFor({ timeout: 30_000 });

    // Opening another plan now would drop the edit: refused, with the reason.
    await openView();
    await row('(copy)').locator('[data-testid=open-plan]').click();
    await expect
      .poll(() => view().locator('[data-testid=library-message]').innerText())
      .toMatch(
        /^Another plan was not opened: the latest edits of this one are not in the library yet \(autosave failed\)/,
      );
    await view().locator('[data-testid=close-library]').click();
    await expect(shownAltitude()).resolves.toBe('131');

    // The page goes (pagehide): the edit waits in localStorage and is back on the next start.
    await page.evaluate(() => window.dispatchEvent(new Event('pagehide')));
    await page.reload();
    await ready();
    await expect.poll(shownAltitude, { timeout: 30_000 }).toBe('131');
    await savedAltitude(131);
    await expect
      .poll(() => page.evaluate(() => localStorage.getItem('seedfall.library.unsaved.v1')), {
        timeout: 30_000,
      })
      .toBeNull();
    await expect(page.locator('[data-testid=notice]').innerText()).resolves.toMatch(
      /they are back/,
    );
    expect(errors).toEqual([]);
  });
});

describe('the first start with a library', () => {
  it('moves the old autosave and its elevation model into the library once', async () => {
    context = await browser.newContext({ viewport: { width: 1280, height: 800 } });
    page = await context.newPage();
    errors = watchErrors(page);
    // A blank page of the app's origin writes what the app before the library kept, before the
    // app itself first runs.
    const base = inject('baseUrl');
    await context.route(`${base}seed.html`, (r) =>
      r.fulfill({ contentType: 'text/html', body: '<!doctype html><title>seed</title>' }),
    );
    await page.goto(`${base}seed.html`);
    const old = {
      ...demo,
      name: 'Old autosave',
      release: { ...(demo.release as object), altitude_m: 123 },
    };
    await page.evaluate(
      ([key, text]) =>
        new Promise<void>((resolve, reject) => {
          localStorage.setItem(key, text);
          const req = indexedDB.open('seedfall-terrain', 1);
          req.onupgradeneeded = () => req.result.createObjectStore('files');
          req.onerror = () => reject(req.error);
          req.onsuccess = () => {
            const db = req.result;
            const tx = db.transaction('files', 'readwrite');
            tx.objectStore('files').put(
              { name: 'old.asc', file: new Blob(['ncols 2\n']), savedAt: '2026-11-01T00:00:00Z' },
              'current',
            );
            tx.oncomplete = () => {
              db.close();
              resolve();
            };
            tx.onerror = () => reject(tx.error);
          };
        }),
      [DRAFT_KEY, JSON.stringify(old)] as const,
    );
    await page.goto(base);
    await ready();
    await expect.poll(shownAltitude, { timeout: 30_000 }).toBe('123');
    await expect
      .poll(() => page.evaluate((k) => localStorage.getItem(k), DRAFT_KEY), { timeout: 30_000 })
      .toBeNull();
    let h = await held();
    expect(h.plans.map((p) => [p.name, p.altitude])).toEqual([['Old autosave', 123]]);
    await openView();
    await expect(row('Old autosave').innerText()).resolves.toContain('with old.asc');
    await shot(page, 'library-migrated');
    await view().locator('[data-testid=close-library]').click();
    // The model moved with it: the Terrain section names it (it reads as no model, and is kept).
    await expect
      .poll(() => page.locator('[data-testid=terrain-kept]').innerText(), { timeout: 60_000 })
      .toBe('old.asc');
    const dbs = await page.evaluate(async () => (await indexedDB.databases()).map((d) => d.name));
    expect(dbs).not.toContain('seedfall-terrain');

    // Once: a reload opens the same plan and adds nothing.
    await editAltitude('124');
    await savedAltitude(124);
    await page.reload();
    await ready();
    await expect.poll(shownAltitude, { timeout: 30_000 }).toBe('124');
    h = await held();
    expect(h.plans).toHaveLength(1);
    expect(errors).toEqual([]);
  });
});
