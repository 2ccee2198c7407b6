import { defineConfig } from 'vitest/config';
import vue from '@vitejs/plugin-vue';

// The renderer builds to dist/renderer; relative asset paths let Electron load it from file://
// and the browser host serve it from any folder.
export default defineConfig({
  root: 'renderer',
  base: './',
  plugins: [vue()],
  build: { outDir: '../dist/renderer', emptyOutDir: true, sourcemap: true },
  test: {
    root: '.',
    include: ['test/**/*.test.ts'],
    globalSetup: ['test/support/global-setup.ts'],
    environment: 'node',
    testTimeout: 30_000,
    hookTimeout: 120_000,
    pool: 'forks',
  },
});
