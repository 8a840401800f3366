// @ts-check
import { defineConfig } from 'astro/config';
import node from '@astrojs/node';
import react from '@astrojs/react';
import tailwindcss from '@tailwindcss/vite';

export default defineConfig({
  // PLATEWRIGHT_DIST lets test runs build beside the app's own dist/ without touching it
  outDir: process.env.PLATEWRIGHT_DIST ?? './dist',
  output: 'server',
  adapter: node({ mode: 'standalone' }),
  integrations: [react()],
  security: {
    checkOrigin: true,
    // Hosts whose Host / X-Forwarded-Host header is trusted. Without any, every request URL is
    // http://localhost and the origin check refuses the app's own form posts. APP_URL's host (set
    // when building for production) is added to the local ones.
    allowedDomains: [
      { hostname: '127.0.0.1' },
      { hostname: 'localhost' },
      ...(process.env.APP_URL ? [{ hostname: new URL(process.env.APP_URL).hostname }] : []),
    ],
  },
  server: { host: '127.0.0.1', port: 4321 },
  vite: {
    plugins: [tailwindcss()],
    worker: { format: 'es' },
    // production builds: terser (two passes) ships ≈ 3 % less JavaScript than the default
    // minifier; test builds keep the faster default
    build: process.env.NODE_ENV === 'test' ? {} : { minify: 'terser', terserOptions: { compress: { passes: 2 } } },
    optimizeDeps: { exclude: ['replicad-opencascadejs'] },
    resolve: { alias: { '~': new URL('./src', import.meta.url).pathname } },
  },
});
