import { preloadPglite } from './db/pglite-preload';

/**
 * The production entry (`npm run serve`, bundled to dist/server/main.mjs). It starts compiling
 * the embedded database's WebAssembly before loading anything else, then loads the server: the
 * two overlap instead of adding up (start-up, tests/bench/NOTES.md).
 */
if (!process.env['DATABASE_URL']) preloadPglite();
const { serveFromEnvironment } = await import('./main');
await serveFromEnvironment();
