import { spawnSync, type SpawnSyncReturns } from 'node:child_process';
import path from 'node:path';
import { writePrecompressed } from '../server/core/precompressed-files';
import { webRoot } from '../server/project-paths';

/**
 * The environment every production build of the web app runs with. `NG_BUILD_OPTIMIZE_CHUNKS`
 * turns on the application builder's chunk optimizer (@angular/build, `environment-options`:
 * "When `NG_BUILD_OPTIMIZE_CHUNKS` is enabled, the build will optimize chunks"), a second bundling
 * pass that merges the small shared chunks esbuild's code splitting leaves: the pass-off screen
 * opens from about half as many files, and each file costs a round trip on a slow link.
 */
export const webBuildEnvironment = { NG_BUILD_OPTIMIZE_CHUNKS: '1' } as const;

/**
 * Runs `ng build` with the arguments given (a project name, options) in the web build's
 * environment; `inherit` shows the builder's output, else it is captured for the caller. A build
 * of the app itself (no other project named) then writes the brotli copies the server sends.
 */
export function buildWeb(
  args: readonly string[] = [],
  output: 'inherit' | 'capture' = 'inherit',
): SpawnSyncReturns<string> {
  const result = spawnSync('npx', ['ng', 'build', ...args], {
    stdio: output === 'inherit' ? 'inherit' : 'pipe',
    encoding: 'utf8',
    env: { ...process.env, ...webBuildEnvironment },
  });
  const project = args.find((arg) => !arg.startsWith('-')) ?? 'tuttiboard';
  // `--output-path=<folder>` moves the build (Angular CLI: the browser files go to its `browser/`).
  const outputPath = args.find((arg) => arg.startsWith('--output-path='))?.split('=')[1];
  if (result.status === 0 && project === 'tuttiboard') {
    const written = writePrecompressed(outputPath ? path.resolve(outputPath, 'browser') : webRoot);
    if (output === 'inherit')
      process.stdout.write(
        `Brotli copies of ${written.files} scripts and stylesheets: ${Math.round(written.raw / 1000)} kB → ${Math.round(written.brotli / 1000)} kB.\n`,
      );
  }
  return result;
}

if (import.meta.url === `file://${process.argv[1]}`)
  process.exit(buildWeb(process.argv.slice(2)).status ?? 1);
