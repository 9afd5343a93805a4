import { describe, expect, it } from 'vitest';
import {
  namedScripts,
  screenPreloads,
  staticImports,
  withPreloads,
  type BuildMetafile,
} from './web-preloads';

// A metafile in esbuild's published "metafile" shape: an entry (main) with a static import, a
// lazy screen importing a shared chunk statically and another screen only dynamically.
const metafile: BuildMetafile = {
  outputs: {
    'dist/web/browser/main-AAAAAAAA.js': {
      entryPoint: 'web/main.ts',
      imports: [
        { path: 'dist/web/browser/chunk-CORECORE.js', kind: 'import-statement' },
        { path: 'dist/web/browser/chunk-SCREEN01.js', kind: 'dynamic-import' },
      ],
    },
    'dist/web/browser/chunk-CORECORE.js': { imports: [] },
    'dist/web/browser/chunk-SCREEN01.js': {
      entryPoint: 'web/app/screen.ts',
      imports: [
        { path: 'dist/web/browser/chunk-SHARED01.js', kind: 'import-statement' },
        { path: 'dist/web/browser/chunk-CORECORE.js', kind: 'import-statement' },
        { path: 'dist/web/browser/chunk-DIALOG01.js', kind: 'dynamic-import' },
      ],
    },
    'dist/web/browser/chunk-SHARED01.js': {
      imports: [{ path: 'dist/web/browser/chunk-SCREEN01.js', kind: 'import-statement' }],
    },
    'dist/web/browser/chunk-DIALOG01.js': { entryPoint: 'web/app/dialog.ts', imports: [] },
  },
};

describe('web preloads', () => {
  it('should follow static imports only, each file once, through a cycle', () => {
    expect(staticImports(metafile, 'dist/web/browser/chunk-SCREEN01.js')).toEqual([
      'dist/web/browser/chunk-SCREEN01.js',
      'dist/web/browser/chunk-SHARED01.js',
      'dist/web/browser/chunk-CORECORE.js',
    ]);
  });

  it('should name a screen’s files less those the index page names already', () => {
    const named = new Set(['main-AAAAAAAA.js', 'chunk-CORECORE.js']);
    expect(screenPreloads(metafile, ['web/main.ts', 'web/app/screen.ts'], named)).toEqual([
      'dist/web/browser/chunk-SCREEN01.js',
      'dist/web/browser/chunk-SHARED01.js',
    ]);
    // A module the build did not make an entry of adds nothing.
    expect(screenPreloads(metafile, ['web/app/missing.ts'], named)).toEqual([]);
  });

  it('should read the scripts an index page names and add the preloads after them', () => {
    const page =
      '<html><head></head><body><tb-root></tb-root><link rel="modulepreload" href="chunk-CORECORE.js"><script src="main-AAAAAAAA.js" type="module"></script></body></html>';
    expect([...namedScripts(page)]).toEqual(['chunk-CORECORE.js', 'main-AAAAAAAA.js']);
    const preloaded = withPreloads(page, ['dist/web/browser/chunk-SCREEN01.js']);
    // HTML Living Standard, "Link type modulepreload": a link element with rel and href.
    expect(preloaded).toContain(
      '<script src="main-AAAAAAAA.js" type="module"></script><link rel="modulepreload" href="chunk-SCREEN01.js"></body>',
    );
  });
});
