import { defineConfig } from 'vite';

export default defineConfig({
  base: './',
  // One page that must work offline once loaded: the planning core (proj4, turf, ajv, the WMM
  // coefficients) is one bundle by design, so the default 500 kB warning is raised.
  build: { outDir: 'dist', target: 'es2022', sourcemap: true, chunkSizeWarningLimit: 1500 },
  worker: { format: 'es' },
});
