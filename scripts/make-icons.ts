// Renders the app's icons (public/icons/*.svg, drawn for this project) to the PNG sizes the web
// manifest lists, through Debian's Chromium. The PNGs are committed, so building needs no browser;
// run `npx tsx scripts/make-icons.ts` after changing an SVG.
import { readFileSync } from 'node:fs';
import { chromium } from 'playwright-core';
import { CHROMIUM_ARGS, CHROMIUM_PATH } from '../app/cli/print-pdf';

const DIR = new URL('../public/icons/', import.meta.url);
const ICONS: { svg: string; png: string; size: number }[] = [
  { svg: 'seedfall.svg', png: 'seedfall-192.png', size: 192 },
  { svg: 'seedfall.svg', png: 'seedfall-512.png', size: 512 },
  { svg: 'seedfall-maskable.svg', png: 'seedfall-maskable-512.png', size: 512 },
  { svg: 'seedfall.svg', png: 'apple-touch-icon-180.png', size: 180 },
];

const browser = await chromium.launch({ executablePath: CHROMIUM_PATH, args: CHROMIUM_ARGS });
try {
  const page = await browser.newPage();
  for (const { svg, png, size } of ICONS) {
    const text = readFileSync(new URL(svg, DIR), 'utf8');
    await page.setViewportSize({ width: size, height: size });
    const src = `data:image/svg+xml;base64,${Buffer.from(text).toString('base64')}`;
    await page.setContent(
      `<html><body style="margin:0;background:transparent"><img src="${src}" width="${size}" height="${size}" style="display:block"></body></html>`,
    );
    await page.locator('img').evaluate((img: HTMLImageElement) => img.decode());
    await page.screenshot({
      path: new URL(png, DIR).pathname,
      omitBackground: true,
      clip: { x: 0, y: 0, width: size, height: size },
    });
    console.log(`public/icons/${png} (${size}×${size})`);
  }
} finally {
  await browser.close();
}
