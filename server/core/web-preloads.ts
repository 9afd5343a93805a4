import crypto from 'node:crypto';
import fs from 'node:fs';
import path from 'node:path';
import { embeddedEntryReads, type ScreenRead } from '@shared/api/entry-reads';
import type { Capability } from './policy';

/**
 * The part of the build's metafile read here (esbuild's "metafile" format, which Angular's
 * application builder writes as `stats.json` with `statsJson`): each output file, the source
 * module it is the entry of, the source modules bundled into it, and the files it imports.
 */
export interface BuildMetafile {
  outputs: Record<
    string,
    {
      entryPoint?: string;
      inputs?: Readonly<Record<string, unknown>>;
      imports?: readonly { path: string; kind: string }[];
    }
  >;
}

/**
 * The script file that holds a source module: the output whose entry it is, else the one it was
 * bundled into. After the builder's chunk optimizer (`NG_BUILD_OPTIMIZE_CHUNKS`) a lazy chunk
 * has no `entryPoint` any more (its second pass names only the app's own entries), but each
 * output still lists its `inputs`, as in esbuild's metafile.
 */
export function outputOf(metafile: BuildMetafile, module: string): string | undefined {
  const scripts = Object.entries(metafile.outputs).filter(([file]) => file.endsWith('.js'));
  return (
    scripts.find(([, output]) => output.entryPoint === module)?.[0] ??
    scripts.find(([, output]) => output.inputs && module in output.inputs)?.[0]
  );
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
    const output = outputOf(metafile, module);
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

/** The files a screen's address names ahead: the pattern of its address and the file names. */
export interface ScreenFiles {
  path: RegExp;
  files: readonly string[];
}

/**
 * The script that names a screen's files as `<link rel="modulepreload">` (HTML Living Standard,
 * "Link type modulepreload") when the page is opened at that screen's address. It is in the one
 * index page, so the copy the service worker keeps and answers every navigation with names them
 * too: without it a repeat visit found the screen's code level by level (main, its dynamic
 * imports, the route's chunk, then that chunk's imports), each level only once the one before had
 * been evaluated.
 */
export function preloaderScript(screens: readonly ScreenFiles[]): string {
  const table = JSON.stringify(
    screens.map((screen) => [
      screen.path.source,
      screen.files.map((file) => path.posix.basename(file)),
    ]),
  );
  return (
    `(function(){var s=${table},p=location.pathname,d=document;` +
    `s.forEach(function(e){if(new RegExp(e[0]).test(p))e[1].forEach(function(f){` +
    `var l=d.createElement("link");l.rel="modulepreload";l.href=f;d.head.appendChild(l)})})})()`
  );
}

/**
 * The index page with the preloader, after the app's own script so the initial files are asked
 * for first; and the script's hash for the Content-Security-Policy (CSP Level 3, "hash-source":
 * the base64 SHA-256 of the script's text).
 */
export function withPreloader(
  indexHtml: string,
  screens: readonly ScreenFiles[],
): { html: string; scriptHash: string } {
  const script = preloaderScript(screens);
  const scriptHash = `'sha256-${crypto.createHash('sha256').update(script).digest('base64')}'`;
  return { html: indexHtml.replace('</body>', `<script>${script}</script></body>`), scriptHash };
}

/**
 * The service worker's manifest (ngsw.json) with the index page's hash as served: Angular's worker
 * checks each file it keeps against the SHA-1 of its bytes in `hashTable` and refuses a mismatch,
 * and the index page it keeps is the one with the preloader, not the file the build wrote.
 */
export function withIndexHash(workerManifest: string, indexHtml: string): string {
  const manifest = JSON.parse(workerManifest) as { hashTable?: Record<string, string> };
  if (manifest.hashTable?.['/index.html'] !== undefined)
    manifest.hashTable['/index.html'] = crypto.createHash('sha1').update(indexHtml).digest('hex');
  return JSON.stringify(manifest, null, 2);
}

/** The web app's version-naming files as served, and the screen served at an address. */
export interface WebPages {
  /** The index page (with the preloader when the build wrote its metafile), or undefined with no build. */
  index(): string | undefined;
  /** The service worker's manifest to serve, or undefined when the build has none. */
  workerManifest(): string | undefined;
  /** The CSP hash-sources of the index page's inline script. */
  scriptHashes(): string[];
  /** The screen whose first reads the page served at `pathname` may carry. */
  screen(pathname: string): (typeof preloadedScreens)[number] | undefined;
}

/**
 * The index page, served for every address of the app and kept by the service worker, with the
 * preloader of the screens' files when the build wrote its metafile beside the browser folder;
 * read again when the build's index page changes. With no web root (an app serving only the API)
 * there is no page.
 */
export function webPages(webRoot: string | null): WebPages {
  let built: {
    stamp: number;
    html: string;
    manifest: string | undefined;
    hashes: string[];
  } | null = null;
  // Every response asks (the CSP header names the script's hash), so the build's index page is
  // looked at again at most once a second rather than with a file-system call per request.
  let checkedAt = -Infinity;
  const current = () => {
    if (webRoot === null) return null;
    const now = Date.now();
    if (now - checkedAt < 1000) return built;
    checkedAt = now;
    const indexFile = path.join(webRoot, 'index.html');
    if (!fs.existsSync(indexFile)) return (built = null);
    const stamp = fs.statSync(indexFile).mtimeMs;
    if (built?.stamp === stamp) return built;
    const statsFile = path.join(webRoot, '..', 'stats.json');
    const workerFile = path.join(webRoot, 'ngsw.json');
    const indexHtml = fs.readFileSync(indexFile, 'utf8');
    const metafile = fs.existsSync(statsFile)
      ? (JSON.parse(fs.readFileSync(statsFile, 'utf8')) as BuildMetafile)
      : null;
    const named = namedScripts(indexHtml);
    const page = metafile
      ? withPreloader(
          indexHtml,
          preloadedScreens.map((screen) => ({
            path: screen.path,
            files: screenPreloads(metafile, screen.modules, named),
          })),
        )
      : { html: indexHtml, scriptHash: undefined };
    const manifest = fs.existsSync(workerFile)
      ? withIndexHash(fs.readFileSync(workerFile, 'utf8'), page.html)
      : undefined;
    built = { stamp, html: page.html, manifest, hashes: page.scriptHash ? [page.scriptHash] : [] };
    return built;
  };
  return {
    index: () => current()?.html,
    workerManifest: () => current()?.manifest,
    scriptHashes: () => current()?.hashes ?? [],
    screen: (pathname) => preloadedScreens.find((each) => each.path.test(pathname)),
  };
}
