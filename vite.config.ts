/// <reference types="vitest/config" />
import { defineConfig } from 'vite';
import react from '@vitejs/plugin-react';
import tailwindcss from '@tailwindcss/vite';
import { VitePWA } from 'vite-plugin-pwa';
import theme from './tailwind.config.ts';

const apiPort = process.env.PORT ?? '4870';

const { ink } = theme.theme.extend.colors;

export default defineConfig({
  plugins: [
    react(),
    tailwindcss(),
    // The app-shell worker: the built shell is precached so the scanner opens with no network;
    // /api is never cached (see "Offline shell" in DEVELOPERS.md).
    VitePWA({
      strategies: 'generateSW',
      // A new version waits until the user says "Reload" (src/features/app-worker), never mid-scan.
      registerType: 'prompt',
      // Registered from src/main.tsx through virtual:pwa-register: no inline script for the CSP to refuse.
      injectRegister: false,
      // A build is a build: the worker never carries Workbox's development logging, whatever NODE_ENV says.
      mode: 'production',
      devOptions: { enabled: false },
      manifest: {
        id: '/',
        name: 'Halfmark',
        short_name: 'Halfmark',
        description: 'Chain of custody for test specimens and their halves: scan every hand-off, trace any result.',
        lang: 'en',
        start_url: '/scan',
        scope: '/',
        display: 'standalone',
        orientation: 'any',
        theme_color: ink[900],
        background_color: ink[50],
        icons: [
          { src: '/icons/halfmark-192.png', sizes: '192x192', type: 'image/png', purpose: 'any' },
          { src: '/icons/halfmark-512.png', sizes: '512x512', type: 'image/png', purpose: 'any' },
          { src: '/icons/halfmark-maskable-512.png', sizes: '512x512', type: 'image/png', purpose: 'maskable' },
        ],
      },
      includeAssets: ['halfmark.svg', 'icons/halfmark-touch-180.png'],
      workbox: {
        // The shell: pages, chunks, styles and the shipped fonts (woff2 only: every browser with
        // service workers reads it, so the woff copies would be dead weight in the cache).
        globPatterns: ['**/*.{html,js,css,woff2,svg,png}'],
        navigateFallback: '/index.html',
        // An /api address opened as a page (a PDF, a download) must reach the server, never the shell.
        navigateFallbackDenylist: [/^\/api(\/|$)/],
        // No runtimeCaching: the worker does not answer /api at all, so every API request goes to
        // the network as if there were no worker, and the ledger is never read from a cache.
        cleanupOutdatedCaches: true,
        // The first install takes charge of the open page at once (so it works offline from the
        // first visit); a later version waits for the user's "Reload now" (SKIP_WAITING message).
        clientsClaim: true,
        skipWaiting: false,
      },
    }),
  ],
  server: {
    host: '127.0.0.1',
    proxy: { '/api': `http://127.0.0.1:${apiPort}` },
  },
  // Nothing inlined as data: URIs, so the Content-Security-Policy can stay at 'self'.
  build: { outDir: 'dist', sourcemap: false, assetsInlineLimit: 0 },
  test: {
    include: ['shared/**/*.test.ts', 'labels/**/*.test.ts', 'server/**/*.test.ts', 'tests/**/*.test.ts'],
    pool: 'forks',
    testTimeout: 30_000,
    hookTimeout: 60_000,
  },
});
