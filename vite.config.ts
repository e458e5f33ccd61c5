import { defineConfig } from 'vite';
import { VitePWA } from 'vite-plugin-pwa';

// The header's colour and the page's background (app/ui/seedfall-app.ts).
const THEME = '#1f3a34';
const BACKGROUND = '#ffffff';

export default defineConfig({
  base: './',
  // One page that must work offline once loaded: the planning core (proj4, turf, ajv, the WMM
  // coefficients) is one bundle by design, so the default 500 kB warning is raised.
  build: { outDir: 'dist', target: 'es2022', sourcemap: true, chunkSizeWarningLimit: 1500 },
  worker: { format: 'es' },
  plugins: [
    // Installable and offline (docs/decisions/0009-service-worker-vite-plugin-pwa.md): a Workbox
    // service worker precaches every file of the build, the workers' chunks included, and waits
    // for the person's click before a new version takes over (app/ui/pwa-update.ts).
    VitePWA({
      registerType: 'prompt',
      injectRegister: false,
      filename: 'sw.js',
      scope: './',
      manifest: {
        id: './',
        name: 'Seedfall — drop planner',
        short_name: 'Seedfall',
        description:
          'Plans drops of small autorotating sensor vehicles from a carrier aircraft: reach, drift, dispersion and release windows. Works offline after one visit.',
        start_url: './',
        scope: './',
        display: 'standalone',
        orientation: 'any',
        theme_color: THEME,
        background_color: BACKGROUND,
        lang: 'en',
        categories: ['utilities', 'productivity'],
        icons: [
          { src: 'icons/seedfall-192.png', sizes: '192x192', type: 'image/png', purpose: 'any' },
          { src: 'icons/seedfall-512.png', sizes: '512x512', type: 'image/png', purpose: 'any' },
          {
            src: 'icons/seedfall-maskable-512.png',
            sizes: '512x512',
            type: 'image/png',
            purpose: 'maskable',
          },
          { src: 'icons/seedfall.svg', sizes: 'any', type: 'image/svg+xml', purpose: 'any' },
        ],
      },
      workbox: {
        // Everything the app may load: the page, its chunks (the plan, sweep, import and DEM
        // workers are chunks of their own), styles, icons, fonts, wasm and data files. Source
        // maps stay out: nobody needs them in the field.
        globPatterns: ['**/*.{html,js,mjs,css,svg,png,ico,webmanifest,json,woff,woff2,wasm}'],
        // The planning core is one large chunk by design (see build above); Workbox would skip a
        // file over its 2 MiB default without failing the build.
        maximumFileSizeToCacheInBytes: 16 * 1024 * 1024,
        navigateFallback: 'index.html',
        cleanupOutdatedCaches: true,
        clientsClaim: false,
        skipWaiting: false,
      },
    }),
  ],
});
