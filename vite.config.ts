/// <reference types="vitest/config" />
import { defineConfig } from 'vite';
import preact from '@preact/preset-vite';
import { VitePWA } from 'vite-plugin-pwa';

// One config for the app build and for the three test projects (unit, server, e2e).
export default defineConfig({
  plugins: [
    preact(),
    VitePWA({
      strategies: 'injectManifest',
      srcDir: 'service-worker',
      filename: 'sw.ts',
      injectRegister: false, // src/main.tsx registers /sw.js itself
      manifest: false, // public/manifest.webmanifest is the one manifest
      injectManifest: { globPatterns: ['**/*.{js,css,html,svg,png,webmanifest}'] },
    }),
  ],
  server: { proxy: { '/api': 'http://127.0.0.1:8080' } },
  build: { target: 'es2022', sourcemap: true },
  test: {
    projects: [
      {
        extends: true,
        test: {
          name: 'unit',
          include: ['test/{engine,schema,store,sync,app,ui}/**/*.test.{ts,tsx}'],
          environment: 'node',
          setupFiles: ['test/setup/unit-setup.ts'],
        },
      },
      {
        extends: true,
        test: { name: 'server', include: ['test/server/**/*.test.ts'], environment: 'node' },
      },
      {
        extends: true,
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
