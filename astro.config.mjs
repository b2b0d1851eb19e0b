// @ts-check
import { defineConfig } from 'astro/config';
import node from '@astrojs/node';
import react from '@astrojs/react';
import tailwindcss from '@tailwindcss/vite';
import { build as esbuild } from 'esbuild';
import { fileURLToPath } from 'node:url';

/**
 * Bundles the two plain-Node entry points beside the server build: the analysis worker, where
 * src/lib/server/analysis-pool.ts finds it, and the HTTP front (scripts/app-server.ts) as
 * `app-server.mjs` in the output folder, so the built server runs on `node` alone.
 * @returns {import('astro').AstroIntegration}
 */
function serverEntries() {
  /** @type {string} */
  let serverDir = '';
  /** @type {string} */
  let outDir = '';
  /** @param {string} entry @param {string} outfile @param {import('esbuild').BuildOptions} [more] */
  const bundle = (entry, outfile, more = {}) =>
    esbuild({
      entryPoints: [fileURLToPath(new URL(entry, import.meta.url))],
      outfile,
      bundle: true,
      platform: 'node',
      format: 'esm',
      target: 'node20',
      logLevel: 'warning',
      ...more,
    });
  return {
    name: 'edgewise-server-entries',
    hooks: {
      'astro:config:done': ({ config }) => {
        serverDir = fileURLToPath(config.build.server);
        outDir = fileURLToPath(config.outDir);
      },
      'astro:build:done': async () => {
        await bundle('./src/lib/server/analysis-worker.ts', `${serverDir}/analysis-worker.mjs`);
        // Packages stay imports (CommonJS ones cannot be inlined into an ES module); the
        // server runs where node_modules is, as the Astro build itself does.
        await bundle('./scripts/app-server.ts', `${outDir}/app-server.mjs`, {
          packages: 'external',
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
  // Middleware mode: scripts/app-server.ts is the HTTP server and serves the built static files.
  adapter: node({ mode: 'middleware' }),
  outDir: process.env.EDGEWISE_OUT_DIR ?? './dist',
  integrations: [react(), serverEntries()],
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
