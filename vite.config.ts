import { defineConfig } from 'vite';

export default defineConfig({
  base: './',
  build: { outDir: 'dist', target: 'es2022', sourcemap: true },
  worker: { format: 'es' },
});
