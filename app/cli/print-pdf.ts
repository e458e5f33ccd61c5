/**
 * Node-only: prints an HTML document to PDF in Debian's Chromium through playwright-core (the
 * same browser the tests use). Only the CLI uses it: it starts a browser.
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

/** Longest a launch, load or print may take before it fails with a message, ms. */
const STEP_TIMEOUT_MS = 60_000;

/**
 * Writes html as a PDF at path with the given paper size. The page runs no script and loads
 * nothing but data: URIs, whatever the HTML holds (its text may come from a plan file).
 */
export async function printPdf(html: string, path: string, paper: 'A4' | 'Letter'): Promise<void> {
  const { chromium } = await import('playwright-core');
  const browser = await chromium.launch({
    executablePath: CHROMIUM_PATH,
    args: CHROMIUM_ARGS,
    timeout: STEP_TIMEOUT_MS,
  });
  try {
    const context = await browser.newContext({ javaScriptEnabled: false, offline: true });
    context.setDefaultTimeout(STEP_TIMEOUT_MS);
    await context.route('**/*', (route) =>
      route.request().url().startsWith('data:') ? route.continue() : route.abort(),
    );
    const page = await context.newPage();
    await page.setContent(html, { waitUntil: 'load' });
    // The brief numbers its pages itself ("page N of M" in @page margin boxes, Chromium 131 and
    // later), the same when printed from the app; Chromium's own header and footer stay off, or
    // every page would carry the numbers twice.
    await page.pdf({
      path,
      format: paper,
      printBackground: true,
      preferCSSPageSize: true,
      displayHeaderFooter: false,
    });
  } finally {
    await browser.close();
  }
}
