import fs from 'node:fs';
import path from 'node:path';
import { describe, expect, it } from 'vitest';
import { iconNames } from './icon-names';

const root = path.resolve(import.meta.dirname, '../../..');
const packageFolder = path.join(root, 'node_modules/@material-symbols/svg-400/outlined');

function sourceFiles(folder: string): string[] {
  return fs.readdirSync(folder, { withFileTypes: true }).flatMap((entry) => {
    const full = path.join(folder, entry.name);
    if (entry.isDirectory()) return sourceFiles(full);
    return /\.(html|ts)$/.test(entry.name) && !entry.name.endsWith('.spec.ts') ? [full] : [];
  });
}

/**
 * Icon names written in templates and code: `svgIcon="x"`, a branch `? 'x'` inside `[svgIcon]`,
 * `icon: 'x'`, and `icon="x"` on a `<tb-icon-button>` or `<tb-dialog-actions>`.
 */
function namesUsed(): Set<string> {
  const used = new Set<string>();
  for (const file of sourceFiles(path.join(root, 'web/app'))) {
    const text = fs.readFileSync(file, 'utf8');
    for (const match of text.matchAll(/svgIcon="([a-z0-9_]+)"/g)) used.add(match[1]!);
    for (const match of text.matchAll(/\[svgIcon\]="([^"]*)"/g))
      for (const quoted of match[1]!.matchAll(/[?:]\s*'([a-z0-9_]+)'/g)) used.add(quoted[1]!);
    for (const match of text.matchAll(/\bicon: '([a-z0-9_]+)'/g)) used.add(match[1]!);
    for (const match of text.matchAll(
      /<tb-(?:icon-button|dialog-actions)[^>]*\sicon="([a-z0-9_]+)"/g,
    ))
      used.add(match[1]!);
  }
  return used;
}

describe('icons', () => {
  it('should copy exactly the registered icons into the build', () => {
    const angular = JSON.parse(fs.readFileSync(path.join(root, 'angular.json'), 'utf8'));
    const assets: { glob: string; output?: string }[] =
      angular.projects.tuttiboard.architect.build.options.assets;
    const icons = assets.find((asset) => asset.output === 'icons');
    const listed = /^\{(.*)\}\.svg$/.exec(icons?.glob ?? '')?.[1]?.split(',') ?? [];
    expect([...listed].sort()).toEqual([...iconNames].sort());
  });

  it('should name only icons the package ships', () => {
    const missing = iconNames.filter(
      (name) => !fs.existsSync(path.join(packageFolder, `${name}.svg`)),
    );
    expect(missing).toEqual([]);
  });

  it('should register every icon the screens ask for', () => {
    const used = namesUsed();
    // The scan finds the icons of the rail and the buttons, so it cannot come back empty.
    expect(used.size).toBeGreaterThan(40);
    const registered = new Set<string>(iconNames);
    expect([...used].filter((name) => !registered.has(name))).toEqual([]);
  });
});

describe('icons shipped in the code', () => {
  const text = fs.readFileSync(path.join(root, 'web/app/core/inline-icons.ts'), 'utf8');
  const imported = new Map(
    [
      ...text.matchAll(
        /import (\w+) from '@material-symbols\/svg-400\/outlined\/([a-z0-9_]+)\.svg'/g,
      ),
    ].map((match) => [match[1]!, match[2]!]),
  );
  const entries = [...text.matchAll(/^ {2}([a-z0-9_]+): (\w+),$/gm)].map((match) => ({
    name: match[1]!,
    file: imported.get(match[2]!),
  }));

  it('should name each inlined icon after the file it imports', () => {
    // The shell's navigation alone draws more than a dozen, so the scan cannot come back empty.
    expect(entries.length).toBeGreaterThan(12);
    expect(entries.filter((entry) => entry.file !== entry.name)).toEqual([]);
  });

  it('should inline only registered icons, and every icon of the navigation', () => {
    const registered = new Set<string>(iconNames);
    expect(entries.filter((entry) => !registered.has(entry.name))).toEqual([]);
    const navigation = fs.readFileSync(
      path.join(root, 'web/app/core/layout/navigation.ts'),
      'utf8',
    );
    const inlined = new Set(entries.map((entry) => entry.name));
    const rail = [...navigation.matchAll(/\bicon: '([a-z0-9_]+)'/g)].map((match) => match[1]!);
    expect(rail.length).toBeGreaterThan(12);
    expect(rail.filter((name) => !inlined.has(name))).toEqual([]);
  });
});
