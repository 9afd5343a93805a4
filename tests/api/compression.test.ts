import http from 'node:http';
import zlib from 'node:zlib';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { demoEmail, startTestApp, type TestApp } from '../support/test-app';

/** The raw bytes and headers of a GET, with no decoding by the client. */
function rawGet(
  url: string,
  headers: Record<string, string>,
): Promise<{ status: number; headers: http.IncomingHttpHeaders; body: Buffer }> {
  return new Promise((resolve, reject) => {
    http
      .get(url, { headers }, (response) => {
        const chunks: Buffer[] = [];
        response.on('data', (chunk: Buffer) => chunks.push(chunk));
        response.on('end', () =>
          resolve({
            status: response.statusCode ?? 0,
            headers: response.headers,
            body: Buffer.concat(chunks),
          }),
        );
        response.on('error', reject);
      })
      .on('error', reject);
  });
}

describe('Compressed answers', () => {
  let app: TestApp;
  let authorization: string;
  beforeAll(async () => {
    app = await startTestApp();
    authorization = `Bearer ${await app.token(demoEmail('director.hpms'))}`;
  });
  afterAll(async () => {
    await app?.close();
  });

  // RFC 9110 §12.5.3 (Accept-Encoding) and §8.4 (Content-Encoding); brotli is RFC 7932, gzip
  // RFC 1952. Node's own zlib decodes each, independently of the server's middleware.
  it('should send the API JSON in the coding the client accepts, decoding to the same answer', async () => {
    const target = `${app.url}/api/ensembles?limit=100`;
    const plain = await rawGet(target, { authorization, 'accept-encoding': 'identity' });
    expect(plain.status).toBe(200);
    expect(plain.headers['content-encoding']).toBeUndefined();
    const expected: unknown = JSON.parse(plain.body.toString('utf8'));
    expect((expected as { rows: unknown[] }).rows.length).toBeGreaterThan(0);

    const brotli = await rawGet(target, { authorization, 'accept-encoding': 'gzip, deflate, br' });
    expect(brotli.headers['content-encoding']).toBe('br');
    expect(brotli.headers['vary']).toMatch(/accept-encoding/i);
    expect(brotli.body.length).toBeLessThan(plain.body.length / 3);
    expect(JSON.parse(zlib.brotliDecompressSync(brotli.body).toString('utf8'))).toEqual(expected);

    const gzip = await rawGet(target, { authorization, 'accept-encoding': 'gzip' });
    expect(gzip.headers['content-encoding']).toBe('gzip');
    expect(JSON.parse(zlib.gunzipSync(gzip.body).toString('utf8'))).toEqual(expected);
  });

  // RFC 9110 §12.5.3: a client that sends no Accept-Encoding gets the identity coding.
  it('should send small answers and clients that ask for no coding the bytes as they are', async () => {
    const bare = await rawGet(`${app.url}/api/ensembles?limit=100`, { authorization });
    expect(bare.headers['content-encoding']).toBeUndefined();
    expect(JSON.parse(bare.body.toString('utf8'))).toHaveProperty('rows');
    // The middleware's threshold: answers under 1 kB go out as they are.
    const small = await rawGet(`${app.url}/api/no-such-route`, {
      authorization,
      'accept-encoding': 'br',
    });
    expect(small.status).toBe(404);
    expect(small.body.length).toBeLessThan(1024);
    expect(small.headers['content-encoding']).toBeUndefined();
  });
});
