import { mkdtempSync, writeFileSync } from 'node:fs';
import { tmpdir } from 'node:os';
import { join } from 'node:path';
import type { Browser, Page } from 'playwright-core';
import { afterAll, beforeAll, describe, expect, inject, it } from 'vitest';
import demo from '../../data/demo-plan.json';
import { shot, launch, watchErrors } from './browser';

// Script-bearing text as it could arrive in a plan, an import or a settings field: markup that
// runs on parsing (img onerror, svg onload, iframe srcdoc) and attribute break-outs. OWASP XSS
// Filter Evasion Cheat Sheet patterns (common practice). Each is a valid id: 1–64 printable
// characters with no leading or trailing space (plan.schema.json, definitions.id).
const P = {
  siteImg: '<img src=x onerror="window.__pwned=1">',
  siteSvg: '"><svg onload=window.__pwned=2>',
  variantImg: '<img src=x onerror=window.__pwned=3>',
  variantSvg: "'><svg/onload=window.__pwned=4>",
  siteName: '<b onmouseover=window.__pwned=5>bold</b>',
  zoneName: '<svg onload=window.__pwned=6>',
  csvId: '<img src=x onerror=window.__pwned=7>',
  csvName: '<svg onload=window.__pwned=8>',
  geojsonId: '<iframe srcdoc="<script>window.__pwned=9</script>">',
  kmlName: '<img src=x onerror=window.__pwned=10>',
  attribution: '<img src=x onerror=window.__pwned=11>',
};

/** A 1×1 PNG as a tile "server" that needs no network (img-src allows data:). */
const TILE =
  'data:image/png;base64,iVBORw0KGgoAAAANSUhEUgAAAAEAAAABCAYAAAAfFcSJAAAADUlEQVR42mP8/5+hHgAHggJ/PchI7wAAAABJRU5ErkJggg==';

/** The demo plan with payload ids: two variants renamed (pins follow), two sites, a zone. */
function hostilePlan(): Record<string, unknown> {
  const plan = structuredClone(demo) as unknown as {
    variants: { id: string }[];
    sites: { id: string; name?: string; variant?: string }[];
    monteCarlo?: { samples?: number };
    safety?: { noDropZones?: { properties?: { name?: string } }[] };
  };
  const rename: Record<string, string> = {
    [plan.variants[0].id]: P.variantImg,
    [plan.variants[1].id]: P.variantSvg,
  };
  for (const v of plan.variants) v.id = rename[v.id] ?? v.id;
  for (const s of plan.sites) if (s.variant) s.variant = rename[s.variant] ?? s.variant;
  plan.sites[0].id = P.siteImg;
  plan.sites[1].id = P.siteSvg;
  plan.sites[2].name = P.siteName;
  plan.monteCarlo = { ...plan.monteCarlo, samples: 400 };
  const zone = plan.safety?.noDropZones?.[0];
  if (zone) zone.properties = { ...zone.properties, name: P.zoneName };
  return plan as unknown as Record<string, unknown>;
}

/** Every element of the document, shadow roots included, whose markup came from a payload. */
function payloadElements(page: Page): Promise<string[]> {
  return page.evaluate(() => {
    const found: string[] = [];
    const walk = (root: Document | ShadowRoot): void => {
      for (const el of root.querySelectorAll('*')) {
        const handlers = el.getAttributeNames().filter((n) => /^on/i.test(n));
        if (handlers.length) found.push(`<${el.localName} ${handlers.join(' ')}>`);
        if (el.localName === 'img' && el.getAttribute('src') === 'x') found.push('<img src=x>');
        if (el.localName === 'iframe') found.push('<iframe>');
        if (el.localName === 'b' && el.textContent === 'bold') found.push('<b>bold</b>');
        if (el.shadowRoot) walk(el.shadowRoot);
      }
    };
    walk(document);
    return found;
  });
}

interface LayerTip {
  what: string;
  tips: string[];
}

/**
 * Hovers every interactive path and marker in the map's panes (mouseover dispatched on the
 * element, as Leaflet listens for it) and reads the tooltip each one opens.
 */
function hoverEveryLayer(page: Page): Promise<LayerTip[]> {
  return page.locator('sf-map').evaluate((host) => {
    const root = host.shadowRoot!;
    const targets = root.querySelectorAll<Element>(
      '.leaflet-pane path.leaflet-interactive, .leaflet-pane .leaflet-marker-icon',
    );
    const out: { what: string; tips: string[] }[] = [];
    for (const el of targets) {
      const box = el.getBoundingClientRect();
      const at = { clientX: box.x + box.width / 2, clientY: box.y + box.height / 2 };
      el.dispatchEvent(new MouseEvent('mouseover', { bubbles: true, ...at }));
      const tips = [...root.querySelectorAll<HTMLElement>('.leaflet-tooltip')].map(
        (t) => t.innerText,
      );
      out.push({ what: el.getAttribute('class') ?? el.localName, tips });
      el.dispatchEvent(new MouseEvent('mouseout', { bubbles: true, ...at }));
    }
    return out;
  });
}

let browser: Browser;
beforeAll(async () => {
  browser = await launch();
});
afterAll(async () => {
  await browser?.close();
});

describe('text from files and fields reaches the page as text', () => {
  it('runs no payload from plan ids, imported site names or the tile attribution, and the CSP holds', async () => {
    const context = await browser.newContext({ viewport: { width: 1280, height: 800 } });
    // Recorded from before the first script of each page: any blocked script, style or worker.
    await context.addInitScript(() => {
      const w = window as unknown as { cspViolations: string[] };
      w.cspViolations = [];
      window.addEventListener(
        'securitypolicyviolation',
        (e) => w.cspViolations.push(`${e.effectiveDirective} ${e.blockedURI} ${e.sourceFile}`),
        true,
      );
    });
    const page = await context.newPage();
    const errors = watchErrors(page);
    await page.goto(inject('baseUrl'));
    await page.locator('[data-testid=planned]').waitFor({ timeout: 30_000 });

    // The page's policy: no eval anywhere, no inline script (CSP Level 3, script-src).
    const csp = await page
      .locator('meta[http-equiv=Content-Security-Policy]')
      .getAttribute('content');
    expect(csp).toBeTruthy();
    const directives = new Map(
      csp!.split(';').map((d) => {
        const [name, ...values] = d.trim().split(/\s+/);
        return [name, values] as const;
      }),
    );
    expect(csp).not.toContain('unsafe-eval');
    expect(directives.get('script-src')).toEqual(["'self'"]);
    expect(directives.get('object-src')).toEqual(["'none'"]);

    const dir = mkdtempSync(join(tmpdir(), 'seedfall-hostile-'));
    const planFile = join(dir, 'hostile.json');
    writeFileSync(planFile, JSON.stringify(hostilePlan()));
    await page.locator('input[data-testid=open-file]').setInputFiles(planFile);
    await expect
      .poll(() =>
        page
          .locator('sf-map [data-site]')
          .evaluateAll((els) => els.map((e) => e.getAttribute('data-site'))),
      )
      .toContain(P.siteImg);

    // Sites from the three import formats, their names and ids being payloads.
    const [lat, lon] = [demo.sites[0].lat, demo.sites[0].lon];
    await page.locator('[data-tab=sites]').click();
    const imports: [string, string][] = [
      ['sites.csv', `id,name,lat,lon\n${P.csvId},${P.csvName},${lat + 0.0004},${lon}\n`],
      [
        'sites.geojson',
        JSON.stringify({
          type: 'FeatureCollection',
          features: [
            {
              type: 'Feature',
              properties: { id: P.geojsonId, name: P.geojsonId },
              geometry: { type: 'Point', coordinates: [lon + 0.0004, lat] },
            },
          ],
        }),
      ],
      [
        'sites.kml',
        // KML 2.2 (OGC 07-147r2): a Placemark's <name> is text, XML-escaped in the file.
        `<?xml version="1.0" encoding="UTF-8"?><kml xmlns="http://www.opengis.net/kml/2.2"><Document><Placemark><name>${P.kmlName.replace(/&/g, '&amp;').replace(/</g, '&lt;').replace(/>/g, '&gt;')}</name><Point><coordinates>${lon - 0.0004},${lat},0</coordinates></Point></Placemark></Document></kml>`,
      ],
    ];
    for (const [name, text] of imports) {
      const file = join(dir, name);
      writeFileSync(file, text);
      await page.locator('input[data-testid=import-sites]').setInputFiles(file);
      await expect.poll(() => page.locator('[data-testid=notice]').innerText()).toContain(name);
    }
    const siteIds = await page
      .locator('sf-map [data-site]')
      .evaluateAll((els) => els.map((e) => e.getAttribute('data-site')));
    for (const id of [P.siteImg, P.siteSvg, P.csvId, P.geojsonId, P.kmlName]) {
      expect(siteIds, 'site ids on the map, as the file gave them').toContain(id);
    }

    // The attribution typed under Settings, with a tile source so Leaflet shows it.
    await page.locator('[data-tab=settings]').click();
    await page.locator('input[data-setting=tileUrl]').fill(TILE);
    await page.locator('input[data-setting=tileUrl]').dispatchEvent('change');
    await page.locator('input[data-setting=tileAttribution]').fill(P.attribution);
    await page.locator('input[data-setting=tileAttribution]').dispatchEvent('change');
    await expect
      .poll(() => page.locator('sf-map .leaflet-control-attribution').innerText())
      .toContain(P.attribution);

    // Every variant's layers of every kind, so every variant id is in some tooltip.
    for (const kind of ['reach', 'ellipse50', 'landing'])
      await page.locator(`sf-map input[data-kind=${kind}]`).check();
    await page.locator('sf-map input[data-kind=chosen-only]').uncheck();
    await expect
      .poll(() => page.locator('[data-testid=planned]').innerText(), { timeout: 60_000 })
      .toContain(`Planned ${demo.sites.length + 3} sites`);
    await expect
      .poll(() => page.locator('sf-map path.sf-landing').count())
      .toBeGreaterThan(demo.sites.length + 3);

    const layers = await hoverEveryLayer(page);
    // Every result shape, site and release marker opens a tooltip (the track handle has a title).
    const silent = layers.filter((l) => l.tips.length === 0 && !/sf-track-handle/.test(l.what));
    expect(silent).toEqual([]);
    const tipText = layers.flatMap((l) => l.tips).join('\n');
    for (const text of [
      P.siteImg,
      P.siteSvg,
      P.variantImg,
      P.variantSvg,
      P.siteName,
      P.zoneName,
      P.csvId,
      P.csvName,
      P.geojsonId,
      P.kmlName,
    ]) {
      expect(tipText, 'payload shown literally in a tooltip').toContain(text);
    }
    // The results of a payload site carry its id beside a payload variant id, as written.
    expect(tipText).toMatch(/95 % landing ellipse · <img src=x onerror="window.__pwned=1"> · /);

    // The printed brief of the same plan: escaped text, its own policy, a working print button.
    const [brief] = await Promise.all([
      context.waitForEvent('page'),
      page.getByRole('button', { name: 'Brief' }).click(),
    ]);
    await brief.waitForLoadState('load');
    await expect(brief.locator('h1').innerText()).resolves.toContain('Drop brief');
    const briefCsp = await brief
      .locator('meta[http-equiv=Content-Security-Policy]')
      .getAttribute('content');
    expect(briefCsp).toContain("default-src 'none'");
    expect(briefCsp).not.toMatch(/script-src|unsafe-eval/);
    await expect(brief.locator('body').innerText()).resolves.toContain(P.siteImg);
    expect(await payloadElements(brief)).toEqual([]);
    await brief.evaluate(() => {
      window.print = () => ((window as unknown as { printed: boolean }).printed = true);
    });
    await expect
      .poll(async () => {
        await brief.getByRole('button', { name: 'Print brief' }).click();
        return brief.evaluate(() => (window as unknown as { printed?: boolean }).printed);
      })
      .toBe(true);
    expect(await brief.evaluate(() => (window as unknown as { __pwned?: unknown }).__pwned)).toBe(
      undefined,
    );
    expect(
      await brief.evaluate(() => (window as unknown as { cspViolations: string[] }).cspViolations),
    ).toEqual([]);
    await brief.close();

    await shot(page, 'hostile-text');
    expect(await page.evaluate(() => (window as unknown as { __pwned?: unknown }).__pwned)).toBe(
      undefined,
    );
    expect(await payloadElements(page)).toEqual([]);
    expect(
      await page.evaluate(() => (window as unknown as { cspViolations: string[] }).cspViolations),
    ).toEqual([]);
    expect(errors).toEqual([]);
    await context.close();
  });
});
