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

const server = http.createServer((req, res) => {
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
