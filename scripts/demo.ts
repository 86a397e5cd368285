import { execFileSync, spawn } from 'node:child_process';
import { existsSync } from 'node:fs';
import path from 'node:path';
import { fileURLToPath } from 'node:url';

/** `npm run demo`: build, migrate and seed the embedded SQLite database, then serve the app. */
const root = path.resolve(path.dirname(fileURLToPath(import.meta.url)), '..');
const env = {
  ...process.env,
  ASTRO_TELEMETRY_DISABLED: '1',
  DATABASE_PATH: process.env.DATABASE_PATH ?? 'db/data/sunreckon.sqlite',
  HOST: process.env.HOST ?? '127.0.0.1',
  PORT: process.env.PORT ?? '4321',
  SUNRECKON_ENV: process.env.SUNRECKON_ENV ?? 'demo',
};
const run = (cmd: string, args: string[]) => execFileSync(cmd, args, { cwd: root, env, stdio: 'inherit' });

if (!existsSync(path.join(root, 'dist/server/entry.mjs')) || process.env.DEMO_REBUILD !== '0') run('npx', ['astro', 'build']);
run('npx', ['tsx', 'db/seed.ts']);
console.log(`\nSunreckon is starting on http://${env.HOST}:${env.PORT}  (Ctrl+C stops it)\n`);
const server = spawn(process.execPath, ['dist/server/entry.mjs'], { cwd: root, env, stdio: 'inherit' });
const stop = () => server.kill('SIGTERM');
process.on('SIGINT', stop);
process.on('SIGTERM', stop);
server.on('exit', (code) => process.exit(code ?? 0));
