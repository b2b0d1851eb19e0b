// @ts-check
import { defineConfig } from 'astro/config';
import node from '@astrojs/node';
import react from '@astrojs/react';
import tailwindcss from '@tailwindcss/vite';
import { build as esbuild } from 'esbuild';
import { fileURLToPath } from 'node:url';

/** Bundles the analysis worker beside the server build, where src/lib/server/analysis-pool.ts finds it. */
/** @returns {import('astro').AstroIntegration} */
function analysisWorker() {
  /** @type {string} */
  let serverDir = '';
  return {
    name: 'edgewise-analysis-worker',
    hooks: {
      'astro:config:done': ({ config }) => {
        serverDir = fileURLToPath(config.build.server);
      },
      'astro:build:done': async () => {
        await esbuild({
          entryPoints: [fileURLToPath(new URL('./src/lib/server/analysis-worker.ts', import.meta.url))],
          outfile: `${serverDir}/analysis-worker.mjs`,
          bundle: true,
          platform: 'node',
          format: 'esm',
          target: 'node20',
          logLevel: 'warning',
        });
      },
    },
  };
}

// The Node adapter only trusts the Host header for listed domains (fixed at build time). Ports
// are left open so the same build serves `npm start` and the tests' servers on free ports.
const publicHost = new URL(process.env.PUBLIC_ORIGIN ?? 'http://localhost:4321').hostname;
const hosts = [...new Set(['localhost', '127.0.0.1', publicHost])];

export default defineConfig({
  output: 'server',
  adapter: node({ mode: 'standalone' }),
  outDir: process.env.EDGEWISE_OUT_DIR ?? './dist',
  integrations: [react(), analysisWorker()],
  security: {
    // Origins are checked in src/middleware.ts for every state-changing request, so refusals
    // carry the same headers and problem+json bodies as every other response.
    checkOrigin: false,
    allowedDomains: hosts.map((hostname) => ({ hostname })),
  },
  experimental: {
    // Hashes for every script and style Astro emits, so the policy needs no 'unsafe-inline'.
    csp: true,
  },
  vite: {
    plugins: [tailwindcss()],
    // Fonts and images stay files on our origin rather than data: URIs (tighter font-src).
    build: { assetsInlineLimit: 0 },
  },
  server: { host: '127.0.0.1', port: 4321 },
  devToolbar: { enabled: false },
});
