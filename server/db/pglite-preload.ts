import fs from 'node:fs';
import { createRequire } from 'node:module';
import path from 'node:path';

/** What PGlite.create can take instead of reading and compiling its files itself. */
export interface PgliteArtifacts {
  pgliteWasmModule: WebAssembly.Module;
  fsBundle: Blob;
}

let preloading: Promise<PgliteArtifacts> | undefined;

/**
 * Starts reading PGlite's WebAssembly and file-system image and compiling the WebAssembly, at
 * once. The compile runs on V8's background threads, so a server that calls this before loading
 * its own modules has them parsed while the engine compiles, rather than one after the other
 * (start-up, tests/bench/NOTES.md). Only the production entry calls it; without it PGlite reads
 * the same files itself.
 */
export function preloadPglite(): void {
  if (preloading) return;
  const folder = path.dirname(createRequire(import.meta.url).resolve('@electric-sql/pglite'));
  const read = (name: string) => fs.promises.readFile(path.join(folder, name));
  preloading = Promise.all([read('pglite.wasm'), read('pglite.data')]).then(
    async ([wasm, data]) => ({
      pgliteWasmModule: await WebAssembly.compile(wasm),
      fsBundle: new Blob([data]),
    }),
  );
  // A failure is PGlite's to report when it opens: it falls back to reading the files itself.
  preloading.catch(() => undefined);
}

/** The preloaded artifacts, when preloadPglite ran and succeeded; otherwise nothing. */
export async function preloadedPgliteArtifacts(): Promise<Partial<PgliteArtifacts>> {
  return (await preloading?.catch(() => undefined)) ?? {};
}
