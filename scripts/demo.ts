import { execFileSync, spawn } from 'node:child_process';
import { existsSync } from 'node:fs';
import path from 'node:path';
import { fileURLToPath } from 'node:url';
import { startMailCatcher, type MailCatcher } from '../src/server/mail-catcher';
import { weatherEnvFor } from './fakes/weather';

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
run('npx', ['tsx', 'scripts/seed.ts']);

// Mail goes to the local catcher (a real SMTP server on loopback) unless SMTP_URL points elsewhere.
let catcher: MailCatcher | null = null;
if (!process.env.SMTP_URL) {
  const dbPath = path.resolve(root, env.DATABASE_PATH);
  const wanted = Number(process.env.MAIL_CATCHER_PORT ?? 2525);
  catcher = await startMailCatcher({ dbPath, port: wanted }).catch(() => startMailCatcher({ dbPath, port: 0 }));
  Object.assign(env, { SMTP_URL: catcher.url });
}
// Weather comes from the local fake of the weather service unless both its URLs point elsewhere.
const { fake: weather, ...weatherEnv } = await weatherEnvFor(process.env, { port: Number(process.env.FAKE_WEATHER_PORT ?? 8642) });
Object.assign(env, weatherEnv);
console.log(`\nSunreckon is starting on http://${env.HOST}:${env.PORT}  (Ctrl+C stops it)`);
if (catcher) console.log(`Mail is caught on ${catcher.url}: read it at http://${env.HOST}:${env.PORT}/dev/mail`);
if (weather) console.log(`Weather comes from the local fake weather service on ${weather.url}`);
console.log('');
const server = spawn(process.execPath, ['server.mjs'], { cwd: root, env: { ...env, SUNRECKON_DIST: 'dist' }, stdio: 'inherit' });
const stop = () => {
  server.kill('SIGTERM');
  void catcher?.stop();
  void weather?.stop();
};
process.on('SIGINT', stop);
process.on('SIGTERM', stop);
server.on('exit', (code) => process.exit(code ?? 0));
