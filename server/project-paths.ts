import fs from 'node:fs';
import path from 'node:path';
import { fileURLToPath } from 'node:url';

/**
 * The project's root folder: the nearest folder above this module holding the project's
 * package.json. The same answer whether the server runs from its sources (through tsx) or
 * from the bundle `npm run build:server` writes to dist/server/.
 */
function findProjectRoot(start: string): string {
  for (let folder = start; ; folder = path.dirname(folder)) {
    const manifest = path.join(folder, 'package.json');
    if (
      fs.existsSync(manifest) &&
      JSON.parse(fs.readFileSync(manifest, 'utf8')).name === 'tuttiboard'
    )
      return folder;
    if (path.dirname(folder) === folder)
      throw new Error(`No Tuttiboard package.json above ${start}`);
  }
}

export const projectRoot = findProjectRoot(path.dirname(fileURLToPath(import.meta.url)));

/** Where the production build of the Angular app lands. */
export const webRoot = path.join(projectRoot, 'dist/web/browser');

/** The SQL migrations drizzle-kit generates. */
export const migrationsFolder = path.join(projectRoot, 'server/db/migrations');
