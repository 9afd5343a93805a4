import { build } from 'esbuild';
import fs from 'node:fs';
import { projectRoot } from '../server/project-paths';

/**
 * Packages left outside the bundle: PGlite reads its WebAssembly and file-system image from
 * beside its own module, pdfmake and exceljs load on the first PDF or workbook (pdfmake through
 * `require` at run time), and pg-native is node-postgres's optional native driver.
 */
const external = ['@electric-sql/pglite', 'pdfmake', 'exceljs', 'pg-native'];

/**
 * `npm run build:server`: bundles the server and the packages it uses into dist/server/, so a
 * production start reads a few plain JavaScript files instead of compiling every module on the
 * way and resolving hundreds of files in node_modules (start-up, tests/bench/NOTES.md). Paths
 * to the web build and the migrations are found from the project root, so the bundle runs from
 * dist/server/.
 */
export async function buildServer(): Promise<string> {
  const outdir = `${projectRoot}/dist/server`;
  // Chunk names carry a content hash: clear the last build's.
  fs.rmSync(outdir, { recursive: true, force: true });
  await build({
    absWorkingDir: projectRoot,
    // Its `paths` resolve the `@shared/*` alias.
    tsconfig: 'tsconfig.server.json',
    entryPoints: [{ in: 'server/serve.ts', out: 'main' }],
    outdir,
    outExtension: { '.js': '.mjs' },
    bundle: true,
    // The routes load in their own chunk while the database opens (server/main.ts).
    splitting: true,
    platform: 'node',
    target: 'node20',
    format: 'esm',
    external,
    // Bundled CommonJS packages call require() for Node's own modules.
    banner: {
      js: "import { createRequire as createRequireForBundle } from 'node:module'; const require = createRequireForBundle(import.meta.url);",
    },
    sourcemap: true,
    logLevel: 'warning',
  });
  return `${outdir}/main.mjs`;
}

if (import.meta.url === `file://${process.argv[1]}`) {
  const outfile = await buildServer();
  process.stdout.write(`Server bundle written to ${outfile}\n`);
}
