import fs from 'node:fs';
import path from 'node:path';
import { embeddedEntryReads, type ScreenRead } from '@shared/api/entry-reads';
import type { Capability } from './policy';

/**
 * The part of the build's metafile read here (esbuild's "metafile" format, which Angular's
 * application builder writes as `stats.json` with `statsJson`): each output file, the source
 * module it is the entry of, and the files it imports.
 */
export interface BuildMetafile {
  outputs: Record<
    string,
    { entryPoint?: string; imports?: readonly { path: string; kind: string }[] }
  >;
}

/**
 * What every signed-in screen loads as the app starts, after the first bundle: the app's entry
 * (whose static imports the build names in the index page only in part), the signed-in user's
 * schema, the connection notices, the device store and the shell with the district's schema.
 */
const appStart = [
  'web/main.ts',
  'shared/api/me.ts',
  'web/app/core/offline/connection-notices.ts',
  'node_modules/idb-keyval/dist/index.js',
  'web/app/core/layout/shell.ts',
  'shared/api/district.ts',
];

/** A number from a query parameter given once, else null (as the web app reads it). */
const numberParam = (value: unknown): number | null =>
  (typeof value === 'string' && Number(value)) || null;

/**
 * Screens whose code the index page names ahead, by the address it is served for: the app's start
 * and the screen's own component. The pass-off screen is opened on a phone over a slow link, where
 * each level of lazy imports found one after the other costs a round trip. For a signed-in user
 * with the screen's capability the page also carries the answers of the screen's first reads
 * (`reads`, from the address's query), so none of them costs a round trip of its own.
 */
export const preloadedScreens: readonly {
  path: RegExp;
  modules: readonly string[];
  capability: Capability;
  reads: (query: Record<string, unknown>) => ScreenRead[];
}[] = [
  {
    path: /^\/pass-offs\/?$/,
    modules: [...appStart, 'web/app/pass-offs/pass-off-entry/pass-off-entry.ts'],
    capability: 'pass-offs:write',
    reads: (query) => embeddedEntryReads(numberParam(query['ensemble'])),
  },
];

/** The output file `file` and every file it imports statically, directly or not, in import order. */
export function staticImports(metafile: BuildMetafile, file: string): string[] {
  const found: string[] = [];
  const visit = (each: string) => {
    if (found.includes(each) || !metafile.outputs[each]) return;
    found.push(each);
    for (const imported of metafile.outputs[each].imports ?? [])
      if (imported.kind === 'import-statement') visit(imported.path);
  };
  visit(file);
  return found;
}

/**
 * The files to name as `modulepreload` for the source modules given, in their order: each one's
 * output file and its static imports, less those named already. Paths are the metafile's,
 * relative to the build's output folder.
 */
export function screenPreloads(
  metafile: BuildMetafile,
  modules: readonly string[],
  named: ReadonlySet<string>,
): string[] {
  const files: string[] = [];
  for (const module of modules) {
    const output = Object.keys(metafile.outputs).find(
      (file) => metafile.outputs[file]!.entryPoint === module,
    );
    if (!output) continue;
    for (const file of staticImports(metafile, output))
      if (!named.has(path.posix.basename(file)) && !files.includes(file)) files.push(file);
  }
  return files;
}

/** The scripts and module preloads the index page names already. */
export function namedScripts(indexHtml: string): Set<string> {
  return new Set(
    [...indexHtml.matchAll(/<(?:script|link)\b[^>]*\b(?:src|href)="([^"]+\.js)"/g)].map(
      (match) => match[1]!,
    ),
  );
}

/**
 * The index page with `<link rel="modulepreload">` for the files (HTML Living Standard, "Link
 * type modulepreload"), after the app's own script so the initial files are asked for first.
 */
export function withPreloads(indexHtml: string, files: readonly string[]): string {
  const links = files
    .map((file) => `<link rel="modulepreload" href="${path.posix.basename(file)}">`)
    .join('');
  return indexHtml.replace('</body>', `${links}</body>`);
}

/** The index page served for an address: its text, and the screen it is served for. */
export interface IndexPage {
  html: string;
  screen: (typeof preloadedScreens)[number];
}

/**
 * The index page to serve for an address: with the preloads of the screen served there, when the
 * build wrote its metafile beside the browser folder; undefined for the plain file. Read once
 * per build of the index page.
 */
export function indexPages(webRoot: string): (pathname: string) => IndexPage | undefined {
  let built: { stamp: number; pages: (string | undefined)[] } | null = null;
  const pages = () => {
    const indexFile = path.join(webRoot, 'index.html');
    const statsFile = path.join(webRoot, '..', 'stats.json');
    const stamp = fs.statSync(indexFile).mtimeMs;
    if (built?.stamp === stamp) return built.pages;
    const metafile = fs.existsSync(statsFile)
      ? (JSON.parse(fs.readFileSync(statsFile, 'utf8')) as BuildMetafile)
      : null;
    const indexHtml = fs.readFileSync(indexFile, 'utf8');
    built = {
      stamp,
      pages: preloadedScreens.map((screen) =>
        metafile
          ? withPreloads(
              indexHtml,
              screenPreloads(metafile, screen.modules, namedScripts(indexHtml)),
            )
          : undefined,
      ),
    };
    return built.pages;
  };
  return (pathname) => {
    const screen = preloadedScreens.findIndex((each) => each.path.test(pathname));
    const html = screen < 0 ? undefined : pages()[screen];
    return html === undefined ? undefined : { html, screen: preloadedScreens[screen]! };
  };
}
