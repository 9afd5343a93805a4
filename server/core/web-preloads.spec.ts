import crypto from 'node:crypto';
import { describe, expect, it } from 'vitest';
import {
  namedScripts,
  outputOf,
  screenPreloads,
  staticImports,
  withIndexHash,
  withPreloader,
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

  it('should find a module bundled into a chunk with no entry point, as the chunk optimizer writes them', () => {
    // The shape @angular/build's chunk optimizer writes (its `rolldownToEsbuildMetafile`): only
    // the app's own entries keep `entryPoint`; a lazy screen merged with its shared code is found
    // by the source modules in `inputs`. A stylesheet listing the same path is not a script.
    const optimized: BuildMetafile = {
      outputs: {
        'main-BBBBBBBB.js': {
          entryPoint: 'web/main.ts',
          inputs: { 'web/main.ts': { bytesInOutput: 10 } },
          imports: [{ path: 'chunk-SCREEN02.js', kind: 'dynamic-import' }],
        },
        'styles-CCCCCCCC.css': { inputs: { 'web/app/screen.ts': { bytesInOutput: 1 } } },
        'chunk-SCREEN02.js': {
          inputs: {
            'web/app/screen.ts': { bytesInOutput: 40 },
            'node_modules/store/index.js': { bytesInOutput: 20 },
          },
          imports: [{ path: 'chunk-KIT00001.js', kind: 'import-statement' }],
        },
        'chunk-KIT00001.js': { inputs: { 'web/app/kit.ts': { bytesInOutput: 5 } }, imports: [] },
      },
    };
    expect(outputOf(optimized, 'web/main.ts')).toBe('main-BBBBBBBB.js');
    expect(outputOf(optimized, 'web/app/screen.ts')).toBe('chunk-SCREEN02.js');
    expect(outputOf(optimized, 'web/app/missing.ts')).toBeUndefined();
    expect(
      screenPreloads(
        optimized,
        ['web/main.ts', 'node_modules/store/index.js', 'web/app/screen.ts'],
        new Set(['main-BBBBBBBB.js']),
      ),
    ).toEqual(['chunk-SCREEN02.js', 'chunk-KIT00001.js']);
  });

  it('should read the scripts an index page names and add the preloader after them', () => {
    const page =
      '<html><head></head><body><tb-root></tb-root><link rel="modulepreload" href="chunk-CORECORE.js"><script src="main-AAAAAAAA.js" type="module"></script></body></html>';
    expect([...namedScripts(page)]).toEqual(['chunk-CORECORE.js', 'main-AAAAAAAA.js']);
    const { html, scriptHash } = withPreloader(page, [
      { path: /^\/screen\/?$/, files: ['dist/web/browser/chunk-SCREEN01.js'] },
    ]);
    expect(html).toMatch(
      /<script src="main-AAAAAAAA.js" type="module"><\/script><script>.+<\/script><\/body>/,
    );
    // CSP Level 3, "hash-source": 'sha256-' and the base64 SHA-256 of the script element's text.
    const text = /<script>(.+)<\/script>/.exec(html)![1]!;
    expect(scriptHash).toBe(
      `'sha256-${crypto.createHash('sha256').update(text).digest('base64')}'`,
    );
    // Run at each address with a document that records the links added (HTML Living Standard,
    // "Link type modulepreload": a link element with rel and href): only where the screen opens.
    const preloads = (pathname: string) => {
      const added: { rel?: string; href?: string }[] = [];
      const document = {
        createElement: () => ({}),
        head: { appendChild: (link: { rel?: string; href?: string }) => added.push(link) },
      };
      new Function('location', 'document', text)({ pathname }, document);
      return added;
    };
    expect(preloads('/screen')).toEqual([{ rel: 'modulepreload', href: 'chunk-SCREEN01.js' }]);
    expect(preloads('/screen/other')).toEqual([]);
  });
  it("should give the worker's manifest the index page's hash as served, and nothing else", () => {
    const manifest = JSON.stringify({
      index: '/index.html',
      hashTable: { '/index.html': 'built', '/main-AAAAAAAA.js': 'main' },
    });
    const served = JSON.parse(withIndexHash(manifest, '<html>served</html>')) as {
      hashTable: Record<string, string>;
    };
    // Angular's service worker guide: hashTable holds each file's SHA-1, in hex. The SHA-1 of
    // "<html>served</html>" as `sha1sum` prints it.
    expect(served.hashTable).toEqual({
      '/index.html': '594a0fd25028a17070c713cb4fe8c6241ce13af6',
      '/main-AAAAAAAA.js': 'main',
    });
  });
});
