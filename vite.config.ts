/// <reference types="vitest/config" />
import { defineConfig } from 'vite';
import preact from '@preact/preset-vite';
import { VitePWA } from 'vite-plugin-pwa';
import { fileURLToPath } from 'node:url';

// One config for the app build and for the three test projects (unit, server, e2e).
const here = fileURLToPath(new URL('.', import.meta.url));

export default defineConfig({
  // The app's index.html lives in src/ (the top level holds only the fixed set of files).
  root: 'src',
  publicDir: '../public',
  plugins: [
    preact(),
    VitePWA({
      strategies: 'injectManifest',
      srcDir: '../service-worker',
      filename: 'sw.ts',
      injectRegister: false, // src/main.tsx registers /sw.js itself
      manifest: false, // public/manifest.webmanifest is the one manifest
      injectManifest: { globPatterns: ['**/*.{js,css,html,svg,png,webmanifest}'] },
    }),
  ],
  server: { proxy: { '/api': 'http://127.0.0.1:8080' } },
  build: { target: 'es2022', sourcemap: true, outDir: '../dist', emptyOutDir: true },
  test: {
    root: here,
    projects: [
      {
        extends: true,
        root: here,
        test: {
          name: 'unit',
          include: ['test/{engine,schema,store,sync,app,ui}/**/*.test.{ts,tsx}'],
          environment: 'node',
          setupFiles: ['test/setup/unit-setup.ts'],
        },
      },
      {
        extends: true,
        root: here,
        test: { name: 'server', include: ['test/server/**/*.test.ts'], environment: 'node', globalSetup: ['test/setup/postgres-global-setup.ts'] },
      },
      {
        extends: true,
        root: here,
        test: {
          name: 'e2e',
          include: ['test/e2e/**/*.e2e.test.ts'],
          environment: 'node',
          testTimeout: 90_000,
          hookTimeout: 120_000,
          fileParallelism: false,
        },
      },
    ],
  },
});
