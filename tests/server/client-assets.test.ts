import { describe, it, expect, beforeAll, afterAll } from 'vitest';
import supertest from 'supertest';
import { mkdtempSync, mkdirSync, rmSync, writeFileSync } from 'node:fs';
import { tmpdir } from 'node:os';
import path from 'node:path';
import http from 'node:http';
import type { AddressInfo } from 'node:net';
import { brotliCompressSync, brotliDecompressSync, gunzipSync, gzipSync } from 'node:zlib';
import { makeTestApp } from '../setup/test-app';

// Serving the built client: precompressed copies chosen by Accept-Encoding, a year's cache for
// hashed files under /assets, and no long cache for index.html.
let t: Awaited<ReturnType<typeof makeTestApp>>;
let dist: string;
let server: http.Server;
const script = `export const greeting = ${JSON.stringify('station '.repeat(400))};\n`;
const html = '<!doctype html><html><head><script type="module" src="/assets/main-Ab12Cd34.js"></script></head><body><div id="root"></div></body></html>';

beforeAll(async () => {
  dist = mkdtempSync(path.join(tmpdir(), 'kerfbook-dist-'));
  mkdirSync(path.join(dist, 'assets'));
  writeFileSync(path.join(dist, 'index.html'), html);
  writeFileSync(path.join(dist, 'favicon.svg'), '<svg xmlns="http://www.w3.org/2000/svg"/>');
  const file = path.join(dist, 'assets', 'main-Ab12Cd34.js');
  writeFileSync(file, script);
  writeFileSync(`${file}.br`, brotliCompressSync(script));
  writeFileSync(`${file}.gz`, gzipSync(script));
  t = await makeTestApp({ CLIENT_DIST: dist });
  server = t.app.listen(0, '127.0.0.1');
  await new Promise((resolve) => server.once('listening', resolve));
});
afterAll(async () => {
  await new Promise((resolve) => server.close(resolve));
  await t.close();
  rmSync(dist, { recursive: true, force: true });
});

/** The bytes as sent, without the client's automatic decompression (supertest would undo it). */
function fetchRaw(url: string, acceptEncoding: string): Promise<{ status: number; headers: http.IncomingHttpHeaders; body: Buffer }> {
  return new Promise((resolve, reject) => {
    http
      .get(`http://127.0.0.1:${(server.address() as AddressInfo).port}${url}`, { headers: { 'accept-encoding': acceptEncoding } }, (res) => {
        const chunks: Buffer[] = [];
        res.on('data', (c: Buffer) => chunks.push(c));
        res.on('end', () => resolve({ status: res.statusCode ?? 0, headers: res.headers, body: Buffer.concat(chunks) }));
      })
      .on('error', reject);
  });
}

describe('built client', () => {
  it('serves the Brotli copy of a hashed script with a year-long immutable cache', async () => {
    const res = await fetchRaw('/assets/main-Ab12Cd34.js', 'gzip, deflate, br');
    expect(res.status).toBe(200);
    expect(res.headers['content-encoding']).toBe('br');
    expect(res.headers['content-type']).toMatch(/javascript/);
    expect(res.headers['cache-control']).toBe('public, max-age=31536000, immutable');
    expect(res.headers.vary).toMatch(/Accept-Encoding/i);
    expect(brotliDecompressSync(res.body).toString()).toBe(script);
    expect(res.body.length).toBeLessThan(script.length / 10);
  });

  it('serves the gzip copy to a browser without Brotli, and the plain file to one without either', async () => {
    const gz = await fetchRaw('/assets/main-Ab12Cd34.js', 'gzip');
    expect(gz.status).toBe(200);
    expect(gz.headers['content-encoding']).toBe('gzip');
    expect(gz.headers['cache-control']).toBe('public, max-age=31536000, immutable');
    expect(gunzipSync(gz.body).toString()).toBe(script);

    const plain = await fetchRaw('/assets/main-Ab12Cd34.js', 'identity');
    expect(plain.status).toBe(200);
    expect(plain.headers['content-encoding']).toBeUndefined();
    expect(plain.body.toString()).toBe(script);
  });

  it('answers index.html for the app’s paths without a long cache', async () => {
    for (const url of ['/', '/station/C1', '/index.html']) {
      const res = await supertest(t.app).get(url).expect(200);
      expect(res.headers['content-type']).toMatch(/text\/html/);
      expect(res.text).toContain('/assets/main-Ab12Cd34.js');
      expect(res.headers['cache-control']).toBe('no-cache');
    }
    const icon = await supertest(t.app).get('/favicon.svg').expect(200);
    expect(icon.headers['cache-control']).toBe('no-cache');
  });

  it('answers a missing hashed file with 404, not with the app’s HTML', async () => {
    const res = await supertest(t.app).get('/assets/main-Zz99Yy88.js').expect(404);
    expect(res.headers['content-type']).not.toMatch(/html/);
  });

  it('leaves the API uncached by the static rules', async () => {
    const res = await supertest(t.app).get('/api/health').expect(200);
    expect(res.headers['cache-control'] ?? '').not.toMatch(/max-age=31536000/);
  });
});
