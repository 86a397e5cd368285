// Serves the built app: Astro's own handler (static files, then pages and API routes) behind
// gzip/brotli compression, which the adapter's standalone server does not do. Campers open their
// forecast on a weak phone signal at camp: pages, scripts and styles travel compressed.
//   node server.mjs            serves dist/ (SUNRECKON_DIST picks another build folder)
// HOST and PORT as for the adapter (defaults from astro.config.mjs: 127.0.0.1:4321).
import http from 'node:http';
import path from 'node:path';
import { pathToFileURL } from 'node:url';
import compression from 'compression';

// The adapter's entry starts its own server on import unless told not to.
process.env.ASTRO_NODE_AUTOSTART = 'disabled';
const dist = path.resolve(import.meta.dirname, process.env.SUNRECKON_DIST ?? 'dist');
const { handler, options } = await import(pathToFileURL(path.join(dist, 'server/entry.mjs')).href);

const host = process.env.HOST ?? (typeof options.host === 'string' ? options.host : '127.0.0.1');
const port = Number(process.env.PORT ?? options.port ?? 4321);
// Text over 1 KB is compressed (the library's default test of the content type); fonts and images are already packed.
const compress = compression({ threshold: 1024 });

// Behind a proxy without SUNRECKON_TRUST_PROXY=1 every client shares one rate-limit bucket; say so once.
const trustProxy = process.env.SUNRECKON_TRUST_PROXY === '1';
let warnedProxy = false;

const server = http.createServer((req, res) => {
  if (!trustProxy && !warnedProxy && req.headers['x-forwarded-for'] !== undefined) {
    warnedProxy = true;
    console.warn(
      '[sunreckon] requests arrive with X-Forwarded-For but SUNRECKON_TRUST_PROXY is off: every client behind the proxy shares one rate-limit bucket. ' +
        'Set SUNRECKON_TRUST_PROXY=1 when exactly one reverse proxy in front appends the client address (README, Deployment notes).',
    );
  }
  // Static files (/_astro/*, sw.js) are served before the middleware that sets this on pages and API answers.
  res.setHeader('X-Content-Type-Options', 'nosniff');
  compress(req, res, () => handler(req, res));
});
server.listen(port, host, () => console.log(`Sunreckon is serving on http://${host}:${port}`));

// Finish the requests in flight, then exit; a stuck connection does not hold the process past 5 s.
const stop = () => {
  server.close(() => process.exit(0));
  setTimeout(() => process.exit(0), 5000).unref();
};
process.on('SIGTERM', stop);
process.on('SIGINT', stop);
