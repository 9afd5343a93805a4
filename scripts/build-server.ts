import { build } from 'esbuild';
import { projectRoot } from '../server/project-paths';

/**
 * `npm run build:server`: bundles the server's own TypeScript into dist/server/main.mjs, so a
 * production start loads one plain JavaScript file instead of compiling every module on the
 * way (packages from node_modules stay outside the bundle). Paths to the web build and the
 * migrations are found from the project root, so the bundle runs from dist/server/.
 */
export async function buildServer(): Promise<string> {
  const outdir = `${projectRoot}/dist/server`;
  await build({
    absWorkingDir: projectRoot,
    entryPoints: ['server/main.ts'],
    outdir,
    outExtension: { '.js': '.mjs' },
    bundle: true,
    // The routes load in their own chunk while the database opens (server/main.ts).
    splitting: true,
    platform: 'node',
    target: 'node20',
    format: 'esm',
    packages: 'external',
    sourcemap: true,
    logLevel: 'warning',
  });
  return `${outdir}/main.mjs`;
}

if (import.meta.url === `file://${process.argv[1]}`) {
  const outfile = await buildServer();
  process.stdout.write(`Server bundle written to ${outfile}\n`);
}
