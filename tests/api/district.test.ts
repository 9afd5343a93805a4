import fs from 'node:fs';
import path from 'node:path';
import { describe, expect, it } from 'vitest';
import { rowsOf } from '../../server/db/client';
import { demoEmail, useTestApp } from '../support/test-app';

const logos = path.resolve('tests/fixtures/logos');
const dataUrl = (type: string, bytes: Buffer | string) =>
  `data:${type};base64,${Buffer.from(bytes).toString('base64')}`;
const pngLogo = dataUrl('image/png', fs.readFileSync(path.join(logos, 'band.png')));
const svgLogo = dataUrl('image/svg+xml', fs.readFileSync(path.join(logos, 'kestrel.svg')));

const app = useTestApp({ signIn: ['coordinator', 'director.hpms'] });
const { coordinator, 'director.hpms': director } = app.clients;

async function currentVersion(): Promise<number> {
  return (await coordinator.get('/api/district')).body.version;
}

describe('GET /api/district', () => {
  it('should answer the district to every role and 401 to nobody signed in', async () => {
    for (const who of [
      'coordinator',
      'director.hpms',
      'technician',
      'viewer.trhs',
      'student.hpms',
    ]) {
      const client = app.bearer(await app.token(demoEmail(who)));
      const response = await client.get('/api/district');
      expect(response.status, who).toBe(200);
      expect(response.body, who).toMatchObject({
        id: expect.any(Number),
        name: 'Merrow Basin Unified',
        shortName: 'Merrow Basin',
        timeZone: 'America/Los_Angeles',
        contact: {
          address: expect.any(String),
          phone: expect.any(String),
          email: expect.any(String),
        },
        version: expect.any(Number),
      });
      expect(response.body, who).toHaveProperty('logoUrl');
    }
    expect((await app.anonymous.get('/api/district')).status).toBe(401);
  });
});

describe('PATCH /api/district', () => {
  it('should refuse every role but the coordinator with 403', async () => {
    const version = await currentVersion();
    for (const who of ['director.hpms', 'technician', 'viewer.trhs', 'student.hpms']) {
      const client = app.bearer(await app.token(demoEmail(who)));
      expect(
        (await client.patch('/api/district', { name: 'Taken Over', version })).status,
        who,
      ).toBe(403);
    }
    expect((await director.patch('/api/district', { name: 'Taken Over', version })).status).toBe(
      403,
    );
    expect((await coordinator.get('/api/district')).body.name).toBe('Merrow Basin Unified');
  });

  it('should change the settings and audit the record before and after when the coordinator saves', async () => {
    const version = await currentVersion();
    const response = await coordinator.patch('/api/district', {
      version,
      shortName: 'MBU',
      timeZone: 'America/Denver',
      contact: { phone: '(555) 010-9999' },
      mailSenderName: 'MBU Music Office',
    });
    expect(response.status).toBe(200);
    expect(response.body).toMatchObject({
      shortName: 'MBU',
      timeZone: 'America/Denver',
      mailSenderName: 'MBU Music Office',
      version: version + 1,
    });
    expect(response.body.contact.phone).toBe('(555) 010-9999');
    expect(response.body.contact.address).toContain('Basin Avenue');
    const audit = rowsOf<{
      email: string;
      before: { shortName: string };
      after: { shortName: string };
    }>(
      await app.database.db.execute(
        `select u.email, a.before, a.after from audit_log a join users u on u.id = a.user_id where a.entity = 'district' order by a.id desc limit 1` as never,
      ),
    );
    expect(audit[0]).toMatchObject({
      email: demoEmail('coordinator'),
      before: { shortName: 'Merrow Basin' },
      after: { shortName: 'MBU' },
    });
  });

  it('should answer 409 to a stale version and 400 to an unknown time zone, changing nothing', async () => {
    const version = await currentVersion();
    expect(
      (await coordinator.patch('/api/district', { version: version - 1, shortName: 'Old' })).status,
    ).toBe(409);
    const badZone = await coordinator.patch('/api/district', {
      version,
      timeZone: 'Mars/Olympus_Mons',
    });
    expect(badZone.status).toBe(400);
    expect(badZone.body.error.fieldErrors[0].field).toBe('timeZone');
    const empty = await coordinator.patch('/api/district', { version, name: ' ' });
    expect(empty.status).toBe(400);
    expect(await currentVersion()).toBe(version);
  });
});

describe('The district logo', () => {
  const refusals: [string, string, RegExp][] = [
    [
      'a GIF',
      dataUrl('image/gif', Buffer.from('GIF89a\x01\x00\x01\x00\x00\x00\x00;', 'binary')),
      /PNG or an SVG/,
    ],
    ['a file that calls itself a PNG', dataUrl('image/png', 'not really a png'), /not a PNG/],
    [
      'a PNG over 1 MB',
      dataUrl(
        'image/png',
        Buffer.concat([fs.readFileSync(path.join(logos, 'band.png')), Buffer.alloc(1024 * 1024)]),
      ),
      /at most 1 MB/,
    ],
    [
      'an SVG with a script',
      dataUrl(
        'image/svg+xml',
        '<svg xmlns="http://www.w3.org/2000/svg"><script>alert(1)</script></svg>',
      ),
      /<script>/,
    ],
    [
      'an SVG with an event attribute',
      dataUrl(
        'image/svg+xml',
        '<svg xmlns="http://www.w3.org/2000/svg" onload="alert(1)"><rect width="4" height="4"/></svg>',
      ),
      /event attribute/,
    ],
    [
      'an SVG that loads an outside image',
      dataUrl(
        'image/svg+xml',
        '<svg xmlns="http://www.w3.org/2000/svg" xmlns:xlink="http://www.w3.org/1999/xlink"><image xlink:href="https://example.com/x.png" width="4" height="4"/></svg>',
      ),
      /outside itself/,
    ],
    [
      'an SVG with a javascript: link',
      dataUrl(
        'image/svg+xml',
        '<svg xmlns="http://www.w3.org/2000/svg"><a href="javascript:alert(1)"><rect width="4" height="4"/></a></svg>',
      ),
      /outside itself/,
    ],
    [
      'an SVG whose style imports a sheet',
      dataUrl(
        'image/svg+xml',
        '<svg xmlns="http://www.w3.org/2000/svg"><style>@import url(https://example.com/a.css);</style></svg>',
      ),
      /style/,
    ],
    [
      'an SVG with entity declarations',
      dataUrl(
        'image/svg+xml',
        '<!DOCTYPE svg [<!ENTITY x SYSTEM "file:///etc/passwd">]><svg xmlns="http://www.w3.org/2000/svg"><text>&x;</text></svg>',
      ),
      /DOCTYPE/,
    ],
    [
      'an SVG with a foreignObject',
      dataUrl(
        'image/svg+xml',
        '<svg xmlns="http://www.w3.org/2000/svg"><foreignObject><div xmlns="http://www.w3.org/1999/xhtml">hi</div></foreignObject></svg>',
      ),
      /foreignObject/,
    ],
    [
      'an HTML page called an SVG',
      dataUrl('image/svg+xml', '<html><body>hello</body></html>'),
      /not an SVG/,
    ],
  ];

  it.each(refusals)(
    'should answer 400 with the reason and store nothing for %s',
    async (_name, logo, reason) => {
      const before = await coordinator.get('/api/district');
      const response = await coordinator.patch('/api/district', {
        version: before.body.version,
        logo,
      });
      expect(response.status).toBe(400);
      expect(response.body.error.message).toMatch(reason);
      const after = await coordinator.get('/api/district');
      expect(after.body.version).toBe(before.body.version);
      expect(after.body.logoUrl).toBe(before.body.logoUrl);
    },
  );

  it('should store a PNG and an SVG logo and serve them without sign-in, the SVG under a script-free policy', async () => {
    const png = await coordinator.patch('/api/district', {
      version: await currentVersion(),
      logo: pngLogo,
    });
    expect(png.status).toBe(200);
    expect(png.body.logoUrl).toMatch(/^\/district-logo\?v=\d+$/);
    const served = await app.anonymous.get(png.body.logoUrl);
    expect(served.status).toBe(200);
    expect(served.headers['content-type']).toBe('image/png');
    expect(
      Buffer.compare(served.body as Buffer, fs.readFileSync(path.join(logos, 'band.png'))),
    ).toBe(0);

    const svg = await coordinator.patch('/api/district', {
      version: png.body.version,
      logo: svgLogo,
    });
    expect(svg.status).toBe(200);
    expect(svg.body.logoUrl).not.toBe(png.body.logoUrl);
    const servedSvg = await app.anonymous.get(svg.body.logoUrl).buffer(true);
    expect(servedSvg.headers['content-type']).toMatch(/^image\/svg\+xml/);
    expect(servedSvg.headers['content-security-policy']).toMatch(/default-src 'none'/);

    const removed = await coordinator.patch('/api/district', {
      version: svg.body.version,
      logo: null,
    });
    expect(removed.body.logoUrl).toBeNull();
    expect((await app.anonymous.get('/district-logo')).status).toBe(404);
  });
});

describe('The starter ladder', () => {
  it('should give the coordinator a draft of the seven starter rungs to edit, and refuse a director', async () => {
    const draft = await coordinator.post('/api/ladder/versions', { starter: true });
    expect(draft.status).toBe(201);
    expect(draft.body.status).toBe('draft');
    expect(draft.body.name).toBe('Starter scale ladder (draft)');
    expect(draft.body.rungs.map((rung: { number: number }) => rung.number)).toEqual([
      1, 2, 3, 4, 5, 6, 7,
    ]);
    expect(draft.body.benchmarks).toEqual([]);
    expect((await director.post('/api/ladder/versions', { starter: true })).status).toBe(403);
  });
});
