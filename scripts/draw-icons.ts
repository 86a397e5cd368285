// Renders Sunreckon's app icons (our own drawing: a sun setting over the horizon line above a
// battery, in dusk, sun, ember, sand and moss) from public/icons/*.svg to the PNG sizes the web
// manifest lists, with Debian's Chromium. Run: npx tsx scripts/draw-icons.ts
import { readFileSync } from 'node:fs';
import path from 'node:path';
import { chromium } from 'playwright-core';

const ROOT = path.resolve(import.meta.dirname, '..');
const OUT = path.join(ROOT, 'public', 'icons');
const JOBS = [
  { svg: 'icon.svg', png: 'icon-192.png', size: 192 },
  { svg: 'icon.svg', png: 'icon-512.png', size: 512 },
  { svg: 'icon.svg', png: 'apple-touch-icon.png', size: 180, background: '#2F3E55' },
  { svg: 'maskable.svg', png: 'maskable-512.png', size: 512 },
];

const browser = await chromium.launch({ executablePath: process.env.CHROMIUM_PATH ?? '/usr/bin/chromium', args: ['--no-sandbox', '--disable-gpu'] });
try {
  for (const job of JOBS) {
    const page = await browser.newPage({ viewport: { width: job.size, height: job.size }, deviceScaleFactor: 1 });
    const svg = readFileSync(path.join(OUT, job.svg), 'utf8');
    await page.setContent(`<html><body style="margin:0;background:${job.background ?? 'transparent'}">${svg.replace('<svg ', `<svg width="${job.size}" height="${job.size}" `)}</body></html>`);
    await page.screenshot({ path: path.join(OUT, job.png), omitBackground: !job.background, clip: { x: 0, y: 0, width: job.size, height: job.size } });
    await page.close();
    console.log(`${job.png} ${job.size}×${job.size}`);
  }
} finally {
  await browser.close();
}
