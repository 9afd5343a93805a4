import { spawnSync } from 'node:child_process';
import fs from 'node:fs';
import { chromiumPath } from '../tests/support/browser';
import { buildWebIfMissing } from './build-if-missing';

/**
 * `npm test`: type checks, the unit and API suites, a fresh production build, the browser suite
 * and a short benchmark smoke run. It stops at the first failing step.
 */
function run(title: string, command: string, args: string[], environment: NodeJS.ProcessEnv = {}) {
  process.stdout.write(`\n=== ${title}\n`);
  const result = spawnSync(command, args, {
    stdio: 'inherit',
    env: { ...process.env, ...environment },
  });
  if (result.status !== 0) {
    process.stderr.write(`\n${title} failed.\n`);
    process.exit(result.status ?? 1);
  }
}

if (!fs.existsSync(chromiumPath)) {
  process.stderr.write(
    `The browser tests need Chromium at ${chromiumPath}.\nInstall it with: sudo apt-get install -y chromium\n(or set CHROMIUM_PATH to another Chromium).\n`,
  );
  process.exit(1);
}

run('Type check', 'npm', ['run', 'typecheck']);
run('Unit and API tests', 'npx', ['vitest', 'run', '--project', 'unit', '--project', 'api']);
process.stdout.write('\n=== Production build\n');
buildWebIfMissing(true);
run('Browser tests', 'npx', ['vitest', 'run', '--project', 'e2e']);
if (fs.existsSync('tests/bench/run.ts'))
  run('Benchmark smoke run', 'npx', ['tsx', 'tests/bench/run.ts', '--smoke']);
