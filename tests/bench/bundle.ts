import fs from 'node:fs';
import path from 'node:path';
import { gzipSync } from 'node:zlib';
import { buildWeb } from '../../scripts/build-web';
import { figure, type BenchFigure } from './bench-figure';

/** The files a browser loads before the first route: main, its preloaded chunks and styles. */
export function initialFiles(browserFolder: string): string[] {
  const html = fs.readFileSync(path.join(browserFolder, 'index.html'), 'utf8');
  const names = new Set<string>();
  for (const match of html.matchAll(/<(?:script|link)\b[^>]*?(?:src|href)="([^"]+\.(?:js|css))"/g))
    names.add(match[1]!);
  return [...names].map((name) => path.join(browserFolder, name));
}

/** Raw and gzip bytes of a set of files. */
export function sizes(files: string[]): { raw: number; gzip: number } {
  let raw = 0;
  let gzip = 0;
  for (const file of files) {
    const bytes = fs.readFileSync(file);
    raw += bytes.length;
    gzip += gzipSync(bytes, { level: 9 }).length;
  }
  return { raw, gzip };
}

function build(project: string) {
  const result = buildWeb([project], 'capture');
  if (result.status !== 0)
    throw new Error(`ng build ${project} failed:\n${result.stdout}\n${result.stderr}`);
}

/**
 * The initial JavaScript and CSS of the production build against an empty Material app built
 * in the same run. Target: under 350 kB raw; the build's budget fails above 500 kB.
 */
export function benchBundle(options: { rebuild: boolean }): BenchFigure[] {
  if (options.rebuild || !fs.existsSync('dist/web/browser/index.html')) build('tuttiboard');
  build('bench-baseline');
  const app = sizes(initialFiles('dist/web/browser'));
  const baseline = sizes(initialFiles('dist/bench-baseline/browser'));
  const kB = (bytes: number) => bytes / 1000;
  return [
    figure(
      'initial JS+CSS, raw',
      kB(app.raw),
      kB(baseline.raw),
      `target < 350 kB: ${app.raw < 350_000 ? 'met' : 'NOT met'}`,
      'kB',
    ),
    figure('initial JS+CSS, gzip', kB(app.gzip), kB(baseline.gzip), 'transfer size', 'kB'),
  ];
}
