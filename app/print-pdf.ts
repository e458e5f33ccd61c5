/**
 * Node-only: prints an HTML document to PDF in Debian's Chromium through playwright-core (the
 * same browser the tests use). Kept out of app/core because it starts a browser.
 */

/** Chromium flags for this kind of machine: headless, sandbox-less as root, no background traffic. */
export const CHROMIUM_ARGS = [
  '--no-sandbox',
  '--disable-gpu',
  '--disable-quic',
  '--no-first-run',
  '--disable-background-networking',
  '--disable-component-update',
  '--disable-sync',
];

export const CHROMIUM_PATH = process.env.CHROMIUM_PATH ?? '/usr/bin/chromium';

/** Writes html as a PDF at path with the given paper size. */
export async function printPdf(html: string, path: string, paper: 'A4' | 'Letter'): Promise<void> {
  const { chromium } = await import('playwright-core');
  const browser = await chromium.launch({ executablePath: CHROMIUM_PATH, args: CHROMIUM_ARGS });
  try {
    const page = await browser.newPage();
    await page.setContent(html, { waitUntil: 'load' });
    await page.pdf({ path, format: paper, printBackground: true, preferCSSPageSize: true });
  } finally {
    await browser.close();
  }
}
