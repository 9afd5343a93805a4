import compression from 'compression';
import express from 'express';
import fs from 'node:fs';
import http, { type IncomingHttpHeaders } from 'node:http';
import type { AddressInfo } from 'node:net';
import os from 'node:os';
import path from 'node:path';
import zlib from 'node:zlib';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { precompressedFiles, writePrecompressed } from './precompressed-files';

// A minified script as a build ships one: a published bundle of a dependency (rxjs's UMD build).
const script = fs.readFileSync(
  path.resolve('node_modules/rxjs/dist/bundles/rxjs.umd.min.js'),
  'utf8',
);
// A web root as the build leaves it: hashed scripts and a stylesheet (esbuild's and the chunk
// optimizer's hash alphabets), and a file with no hash in its name.
const files: Record<string, string> = {
  'main-3SDGA755.js': script,
  'chunk-6zhjmF-q.js': script.slice(1000),
  'styles-AB12CD34.css': '.sheet{display:grid}'.repeat(200),
  'ngsw-worker.js': script,
};
let folder: string;

/** An answer's status, headers and bytes as sent: Node's http client decodes no content coding. */
async function get(pathname: string, acceptEncoding: string) {
  const app = express();
  app.use(compression());
  app.use(precompressedFiles(folder));
  app.use(express.static(folder));
  const server = app.listen(0, '127.0.0.1');
  await new Promise((resolve) => server.once('listening', resolve));
  try {
    const { port } = server.address() as AddressInfo;
    return await new Promise<{ status: number; headers: IncomingHttpHeaders; body: Buffer }>(
      (resolve, reject) =>
        http
          .get(
            {
              port,
              host: '127.0.0.1',
              path: pathname,
              headers: { 'Accept-Encoding': acceptEncoding },
            },
            (response) => {
              const chunks: Buffer[] = [];
              response.on('data', (chunk: Buffer) => chunks.push(chunk));
              response.on('end', () =>
                resolve({
                  status: response.statusCode!,
                  headers: response.headers,
                  body: Buffer.concat(chunks),
                }),
              );
            },
          )
          .on('error', reject),
    );
  } finally {
    server.close();
  }
}

beforeAll(() => {
  folder = fs.mkdtempSync(path.join(os.tmpdir(), 'tutti-precompressed-'));
  for (const [name, text] of Object.entries(files)) fs.writeFileSync(path.join(folder, name), text);
});
afterAll(() => fs.rmSync(folder, { recursive: true, force: true }));

describe('precompressed files', () => {
  it('should write a brotli copy of each hashed script and stylesheet only, smaller than on the fly', () => {
    const written = writePrecompressed(folder);
    expect(written.files).toBe(3);
    expect(fs.existsSync(path.join(folder, 'ngsw-worker.js.br'))).toBe(false);
    const copy = fs.readFileSync(path.join(folder, 'main-3SDGA755.js.br'));
    expect(zlib.brotliDecompressSync(copy).toString()).toBe(script);
    // The `compression` middleware's own setting (its source: BROTLI_PARAM_QUALITY 4).
    const onTheFly = zlib.brotliCompressSync(script, {
      params: { [zlib.constants.BROTLI_PARAM_QUALITY]: 4 },
    });
    expect(copy.length).toBeLessThan(onTheFly.length);
  });

  it('should send the copy to a browser that accepts brotli, and say so', async () => {
    const answer = await get('/main-3SDGA755.js', 'gzip, deflate, br, zstd');
    expect(answer.status).toBe(200);
    expect(answer.headers['content-encoding']).toBe('br');
    expect(answer.headers['content-type']).toBe('text/javascript; charset=utf-8');
    expect(answer.headers['vary']).toMatch(/accept-encoding/i);
    expect(answer.headers['cache-control']).toBe('public, max-age=31536000, immutable');
    expect(answer.body).toEqual(fs.readFileSync(path.join(folder, 'main-3SDGA755.js.br')));
    expect(zlib.brotliDecompressSync(answer.body).toString()).toBe(script);
  });

  it('should send the plain file, compressed on the fly, when brotli is not accepted', async () => {
    const gzip = await get('/styles-AB12CD34.css', 'gzip');
    expect(gzip.headers['content-encoding']).toBe('gzip');
    expect(zlib.gunzipSync(gzip.body).toString()).toBe(files['styles-AB12CD34.css']);
    // RFC 9110 §12.5.3: a coding with q=0 is not acceptable.
    const refused = await get('/main-3SDGA755.js', 'br;q=0, identity');
    expect(refused.headers['content-encoding']).toBeUndefined();
    expect(refused.body.toString()).toBe(script);
  });

  it('should fall back to the plain file when a name has no copy', async () => {
    const answer = await get('/ngsw-worker.js', 'br');
    expect(answer.status).toBe(200);
    // The `compression` middleware's brotli, from the file itself.
    expect(zlib.brotliDecompressSync(answer.body).toString()).toBe(script);
    expect((await get('/chunk-0000AAAA.js', 'br')).status).toBe(404);
  });
});
