import fs from 'node:fs';
import path from 'node:path';
import { webRoot } from '../server/app';
import { buildWeb } from './build-web';

/** Builds the Angular app when there is no build yet, or when `force` is set. */
export function buildWebIfMissing(force = false): void {
  if (!force && fs.existsSync(path.join(webRoot, 'index.html'))) return;
  process.stdout.write('Building the web app (about half a minute on two cores)…\n');
  const result = buildWeb();
  if (result.status !== 0) {
    throw new Error('The web app did not build; see the messages above.');
  }
}

if (import.meta.url === `file://${process.argv[1]}`)
  buildWebIfMissing(process.argv.includes('--force'));
