import type { Express } from 'express';
import expressStaticGzip from 'express-static-gzip';
import path from 'node:path';

/** Cache-Control of files whose name carries a hash of their content: a new build gets new names. */
export const IMMUTABLE_CACHE = 'public, max-age=31536000, immutable';
/** index.html and other unhashed files: the browser checks back every time (ETag makes that cheap). */
export const REVALIDATE_CACHE = 'no-cache';

/**
 * Serves the built client: the Brotli or gzip copy written at build time when the browser
 * accepts it (vite-plugin-compression2), hashed files under /assets cached for a year, and
 * index.html for every other path so the client router can answer it.
 */
export function serveClient(app: Express, dist: string) {
  const precompressed = { enableBrotli: true, orderPreference: ['br', 'gz'], index: false as const };
  app.use('/assets', expressStaticGzip(path.join(dist, 'assets'), { ...precompressed, serveStatic: { maxAge: '1y', immutable: true, fallthrough: true } }));
  // A missing hashed file is a 404, not the app's HTML under a JavaScript name.
  app.use('/assets', (_req, res) => {
    res.status(404).type('text/plain').send('Not found');
  });
  app.use(
    expressStaticGzip(dist, { ...precompressed, serveStatic: { cacheControl: false, setHeaders: (res) => res.setHeader('Cache-Control', REVALIDATE_CACHE) } }),
  );
  app.get('/{*splat}', (_req, res) => res.sendFile(path.join(dist, 'index.html'), { headers: { 'Cache-Control': REVALIDATE_CACHE } }));
}
