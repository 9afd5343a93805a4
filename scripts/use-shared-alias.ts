import fs from 'node:fs';
import path from 'node:path';
import { projectRoot } from '../server/project-paths';

/**
 * `npx tsx scripts/use-shared-alias.ts [--check] [file or folder …]`: rewrites relative imports
 * that climb out to `shared/` (`'../../../shared/api/me'`) as the `@shared/*` path alias
 * (`'@shared/api/me'`) declared in tsconfig.json. With no paths it rewrites web/, server/,
 * tests/, fakes/ and scripts/; `--check` lists what it would change and exits 1 if anything.
 *
 * Left as they are: files inside shared/ (their relative imports stay within it) and the
 * Drizzle schema under server/db/schema/, which drizzle-kit loads without the project's paths.
 */

const defaultRoots = ['web', 'server', 'tests', 'fakes', 'scripts'];
const skipped = [path.join('shared', ''), path.join('server', 'db', 'schema', '')];
const sharedRoot = path.join(projectRoot, 'shared');

/** `from '…'`, `import('…')`, `import '…'` and `vi.mock('…')` specifiers that start with `.`. */
const specifier =
  /(\bfrom\s+|\bimport\s*\(\s*|\bimport\s+|\bvi\.mock\(\s*)(['"])(\.{1,2}\/[^'"]*)\2/g;

/** The source text with its deep relative `shared/` imports written through the alias. */
export function rewriteSharedImports(source: string, filePath: string): string {
  const folder = path.dirname(path.resolve(filePath));
  return source.replace(specifier, (whole, lead: string, quote: string, relative: string) => {
    const target = path.resolve(folder, relative);
    if (target !== sharedRoot && !target.startsWith(sharedRoot + path.sep)) return whole;
    const inShared = path.relative(sharedRoot, target).split(path.sep).join('/');
    return `${lead}${quote}@shared/${inShared}${quote}`;
  });
}

function sourceFiles(entry: string): string[] {
  const full = path.resolve(projectRoot, entry);
  if (!fs.existsSync(full)) return [];
  if (fs.statSync(full).isFile()) return /\.(ts|mts)$/.test(full) ? [full] : [];
  return fs
    .readdirSync(full, { withFileTypes: true })
    .filter((item) => item.name !== 'node_modules' && !item.name.startsWith('.'))
    .flatMap((item) => sourceFiles(path.join(full, item.name)));
}

function isSkipped(file: string): boolean {
  const relative =
    path.relative(projectRoot, file) + (fs.statSync(file).isDirectory() ? path.sep : '');
  return skipped.some((prefix) => relative.startsWith(prefix));
}

if (import.meta.url === `file://${process.argv[1]}`) {
  const check = process.argv.includes('--check');
  const entries = process.argv.slice(2).filter((argument) => argument !== '--check');
  const files = (entries.length ? entries : defaultRoots)
    .flatMap(sourceFiles)
    .filter((file) => !isSkipped(file));
  let changed = 0;
  for (const file of files) {
    const before = fs.readFileSync(file, 'utf8');
    const after = rewriteSharedImports(before, file);
    if (after === before) continue;
    changed += 1;
    if (check) process.stdout.write(`${path.relative(projectRoot, file)}\n`);
    else fs.writeFileSync(file, after);
  }
  process.stdout.write(
    `${check ? 'Would rewrite' : 'Rewrote'} ${changed} of ${files.length} files.\n`,
  );
  if (check && changed > 0) process.exitCode = 1;
}
