import type { TestProject } from 'vitest/node';
import { build, preview, type PreviewServer } from 'vite';

let server: PreviewServer | undefined;

/** Builds the app once and serves it on a free localhost port for every browser test. */
export async function setup(project: TestProject): Promise<void> {
  // Vitest sets NODE_ENV=test, which would make vite pick the packages' development builds; the
  // browser tests must drive the production bundle a user gets from `npm start`.
  const env = process.env.NODE_ENV;
  process.env.NODE_ENV = 'production';
  try {
    await build({ logLevel: 'warn', mode: 'production' });
  } finally {
    process.env.NODE_ENV = env;
  }
  server = await preview({
    preview: { port: 0, host: '127.0.0.1', open: false },
    logLevel: 'warn',
  });
  const url = server.resolvedUrls?.local[0];
  if (!url) throw new Error('vite preview did not report a URL');
  project.provide('baseUrl', url);
}

export async function teardown(): Promise<void> {
  await server?.close();
}

declare module 'vitest' {
  export interface ProvidedContext {
    baseUrl: string;
  }
}
