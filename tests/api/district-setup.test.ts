import fs from 'node:fs';
import os from 'node:os';
import path from 'node:path';
import { afterAll, describe, expect, it } from 'vitest';
import { runTutti } from '../support/cli';
import { startServerProcess, type ServerProcess } from '../support/server-process';

const folders: string[] = [];
const servers: ServerProcess[] = [];

function newFolder(): string {
  const folder = fs.mkdtempSync(path.join(os.tmpdir(), 'tutti-setup-'));
  folders.push(folder);
  return folder;
}

function tutti(dataDir: string, ...args: string[]) {
  // Node's spawn leaves out a variable whose value is undefined: these runs use the data folder.
  return runTutti(args, { TUTTI_DATA_DIR: dataDir, DATABASE_URL: undefined });
}

const kestrel = [
  '--district',
  'Kestrel Valley Schools',
  '--coordinator',
  'music.office@kestrel.example',
];

afterAll(async () => {
  await Promise.all(servers.map((server) => server.stop()));
  for (const folder of folders) fs.rmSync(folder, { recursive: true, force: true });
});

describe('tutti setup on its own data folder', () => {
  it('should exit 2 naming the field, and write nothing, for each bad argument', async () => {
    const folder = newFolder();
    const cases: [string[], RegExp][] = [
      [
        ['--district', 'Kestrel Valley Schools', '--coordinator', 'not-an-email'],
        /--coordinator: .*e-mail/,
      ],
      [['--district', '  ', '--coordinator', 'music.office@kestrel.example'], /--district: /],
      [[...kestrel, '--time-zone', 'Atlantis/Lost_City'], /--time-zone: .*IANA/],
      [['--coordinator', 'music.office@kestrel.example'], /--district/],
      [[...kestrel, '--colour', 'teal'], /Unknown argument '--colour'/],
    ];
    for (const [args, message] of cases) {
      const result = await tutti(folder, 'setup', ...args);
      expect(result.code, args.join(' ')).toBe(2);
      expect(result.stderr, args.join(' ')).toMatch(message);
    }
    // Nothing was written: the setup still works, once, with good arguments.
    const made = await tutti(
      folder,
      'setup',
      ...kestrel,
      '--coordinator-name',
      'Ana Rivas',
      '--time-zone',
      'America/Denver',
    );
    expect(made.code, made.stderr).toBe(0);
    expect(made.stdout).toContain('Set up Kestrel Valley Schools (time zone America/Denver).');
    expect(made.stdout).toContain('First coordinator: Ana Rivas <music.office@kestrel.example>.');
    expect(made.stdout).toMatch(/Sign in as music\.office@kestrel\.example/);

    const again = await tutti(
      folder,
      'setup',
      '--district',
      'Another District',
      '--coordinator',
      'someone@another.example',
    );
    expect(again.code).toBe(2);
    expect(again.stderr).toContain('already set up for Kestrel Valley Schools');
    // The person it made signs in: the API token command finds them.
    const token = await tutti(folder, 'token', 'music.office@kestrel.example');
    expect(token.code, token.stderr).toBe(0);
    expect(token.stdout).toContain('Ana Rivas (coordinator)');
  }, 300_000);

  it('should refuse with exit 2 on the demo district', async () => {
    const folder = newFolder();
    expect((await tutti(folder, 'seed', '--demo')).code).toBe(0);
    const result = await tutti(folder, 'setup', ...kestrel);
    expect(result.code).toBe(2);
    expect(result.stderr).toMatch(/already set up for /);
    const token = await tutti(folder, 'token', 'music.office@kestrel.example');
    expect(token.code).toBe(1);
  }, 300_000);
});

describe('A server on a database with no district', () => {
  it('should answer pages with the not-set-up page, and be set up through the running server', async () => {
    const folder = newFolder();
    const server = await startServerProcess(folder);
    servers.push(server);
    const page = await fetch(`${server.url}/overview`);
    expect(page.status).toBe(503);
    const html = await page.text();
    expect(html).toContain('This Tuttiboard has not been set up');
    expect(html).toContain('tutti setup --district');
    expect(html).not.toMatch(/at \w+ \(|Error:/);
    expect((await fetch(`${server.url}/api/me`)).status).toBe(401);

    const made = await tutti(folder, 'setup', ...kestrel);
    expect(made.code, made.stderr).toBe(0);
    expect(made.stdout).toContain('Set up Kestrel Valley Schools');
    const refused = await tutti(folder, 'setup', ...kestrel);
    expect(refused.code).toBe(2);

    const token = (await tutti(folder, 'token', 'music.office@kestrel.example')).stdout
      .trim()
      .split('\n')
      .pop()!;
    const district = await fetch(`${server.url}/api/district`, {
      headers: { Authorization: `Bearer ${token}` },
    });
    expect(district.status).toBe(200);
    expect(await district.json()).toMatchObject({
      name: 'Kestrel Valley Schools',
      timeZone: 'America/Los_Angeles',
      logoUrl: null,
    });
    const after = await fetch(`${server.url}/overview`);
    expect(await after.text()).not.toContain('has not been set up');
  }, 300_000);
});

describe('The product names no district of its own', () => {
  // Everything that ships (server, web, shared code, scripts, the command, the build config)
  // outside the demo seed, the local fakes and the tests (the unit specs beside the code are
  // tests too). README.md and DEVELOPERS.md describe the demo and are left out; so are generated
  // and installed folders. The pattern also catches the demo's e-mail domain, merrowbasin.example.
  const shipped = ['server', 'web', 'shared', 'scripts', 'bin', 'angular.json', 'package.json'];
  const allowed = [path.join('server', 'seed') + path.sep];

  function files(entry: string): string[] {
    const stat = fs.statSync(entry);
    if (stat.isFile()) return [entry];
    return fs.readdirSync(entry).flatMap((name) => files(path.join(entry, name)));
  }

  it('should find "Merrow Basin" nowhere outside server/seed/, fakes/ and tests/', () => {
    const found = shipped
      .flatMap(files)
      .filter((file) => !allowed.some((prefix) => file.startsWith(prefix)))
      .filter((file) => !file.endsWith('.spec.ts'))
      .filter((file) => /merrow\s*basin/i.test(fs.readFileSync(file, 'latin1')));
    expect(found).toEqual([]);
  });

  it('should find it in the demo seed, so the search itself works', () => {
    expect(fs.readFileSync('server/seed/demo-people.ts', 'utf8')).toMatch(/merrow\s*basin/i);
  });
});
