/// <reference types="vitest/config" />
import { defineConfig } from 'vite';
import react from '@vitejs/plugin-react';
import tailwindcss from '@tailwindcss/vite';

const apiPort = process.env.PORT ?? '4870';

export default defineConfig({
  plugins: [react(), tailwindcss()],
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
