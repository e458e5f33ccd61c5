import type { TestProject } from 'vitest/node';
import { mkdtempSync, rmSync } from 'node:fs';
import { tmpdir } from 'node:os';
import { join } from 'node:path';
import { build, preview, type PreviewServer } from 'vite';

let server: PreviewServer | undefined;
// Each run builds into its own folder, so two runs side by side never serve each other's bundle.
let outDir: string | undefined;

/** Builds the app once and serves it on a free localhost port for every browser test. */
export async function setup(project: TestProject): Promise<void> {
  // Vitest sets NODE_ENV=test, which would make vite pick the packages' development builds; the
  // browser tests must drive the production bundle a user gets from `npm start`.
  const env = process.env.NODE_ENV;
  process.env.NODE_ENV = 'production';
  try {
    outDir = mkdtempSync(join(tmpdir(), 'seedfall-e2e-'));
    await build({ logLevel: 'warn', mode: 'production', build: { outDir, emptyOutDir: true } });
  } finally {
    process.env.NODE_ENV = env;
  }
  server = await preview({
    preview: { port: 0, host: '127.0.0.1', open: false },
    build: { outDir },
    logLevel: 'warn',
  });
  const url = server.resolvedUrls?.local[0];
  if (!url) throw new Error('vite preview did not report a URL');
  project.provide('baseUrl', url);
  // The folder served: a test may put a new version of a file there (tests/e2e/offline.test.ts).
  project.provide('outDir', outDir);
}

export async function teardown(): Promise<void> {
  await server?.close();
  if (outDir) rmSync(outDir, { recursive: true, force: true });
}

declare module 'vitest' {
  export interface ProvidedContext {
    baseUrl: string;
    outDir: string;
  }
}
