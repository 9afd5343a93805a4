import fs from 'node:fs';
import path from 'node:path';
import zlib from 'node:zlib';
import type { RequestHandler } from 'express';

/**
 * The build's scripts and stylesheets at the web root, named with a hash of their content (as
 * `hashedFileName` in server/app.ts reads them): a name never changes content, so its compressed
 * copy is made once, by the build.
 */
const precompressible = /^[\w-]+-[\w-]{8}\.(?:js|css)$/;

/** The file name of a file's brotli copy beside it. */
const brotliCopy = (file: string) => `${file}.br`;

/**
 * Brotli at its highest quality (RFC 7932; Node's zlib: `BROTLI_PARAM_QUALITY` 0–11, text mode,
 * the size as a hint). Too slow to run on every answer (the `compression` middleware uses
 * quality 4), it is run once per file at build time: about 15% fewer bytes than quality 4 for the
 * pass-off screen's first view, on a phone link where bytes are what the screen waits for.
 */
function brotliBest(bytes: Buffer): Buffer {
  return zlib.brotliCompressSync(bytes, {
    params: {
      [zlib.constants.BROTLI_PARAM_QUALITY]: zlib.constants.BROTLI_MAX_QUALITY,
      [zlib.constants.BROTLI_PARAM_MODE]: zlib.constants.BROTLI_MODE_TEXT,
      [zlib.constants.BROTLI_PARAM_SIZE_HINT]: bytes.length,
    },
  });
}

/**
 * Writes the brotli copy of every hashed script and stylesheet in the web root (`main-….js.br`
 * beside `main-….js`); answers how many, and their bytes before and after.
 */
export function writePrecompressed(folder: string): { files: number; raw: number; brotli: number } {
  const written = { files: 0, raw: 0, brotli: 0 };
  for (const name of fs.readdirSync(folder).filter((each) => precompressible.test(each))) {
    const bytes = fs.readFileSync(path.join(folder, name));
    const compressed = brotliBest(bytes);
    fs.writeFileSync(path.join(folder, brotliCopy(name)), compressed);
    written.files++;
    written.raw += bytes.length;
    written.brotli += compressed.length;
  }
  return written;
}

const contentTypes = { js: 'text/javascript; charset=utf-8', css: 'text/css; charset=utf-8' };

/**
 * Answers a hashed script or stylesheet with its brotli copy when the build wrote one and the
 * request accepts brotli (RFC 9110 §12.5.3, Accept-Encoding; `Content-Encoding: br`, and
 * `Vary: Accept-Encoding` so a cache keeps the two representations apart, §12.5.5). Anything
 * else goes on to the plain file, compressed on the fly by the `compression` middleware.
 */
export function precompressedFiles(webRoot: string): RequestHandler {
  // Whether a name has its copy: names carry their content's hash, so the answer never changes
  // for a name (a new build's files have new names).
  const hasCopy = new Map<string, boolean>();
  return (request, response, next) => {
    const name = request.path.slice(1);
    if ((request.method !== 'GET' && request.method !== 'HEAD') || !precompressible.test(name))
      return next();
    response.vary('Accept-Encoding');
    if (request.acceptsEncodings('br') !== 'br') return next();
    const file = path.join(webRoot, brotliCopy(name));
    if (!hasCopy.has(name)) hasCopy.set(name, fs.existsSync(file));
    if (!hasCopy.get(name)) return next();
    response.setHeader('Content-Encoding', 'br');
    response.setHeader('Content-Type', contentTypes[name.endsWith('.css') ? 'css' : 'js']);
    // RFC 8246: the name carries the content's hash, so the file never changes.
    response.sendFile(file, { maxAge: 31_536_000_000, immutable: true }, (error?: Error) => {
      if (!error || response.headersSent) return;
      hasCopy.delete(name);
      response.removeHeader('Content-Encoding');
      response.removeHeader('Content-Type');
      next();
    });
  };
}
