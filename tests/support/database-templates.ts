import fs from 'node:fs';
import os from 'node:os';
import path from 'node:path';
import pg from 'pg';
import { migrateDatabase, openDatabase, type DatabaseHandle } from '../../server/db/client';
import { seedDemo } from '../../server/seed/demo';

/** Which prepared database a test starts from. */
export type TemplateName = 'empty' | 'demo';

/** Where the prepared templates live, handed from the global setup to every test file. */
export interface TemplateLocations {
  /** PGlite images on disk, one per template. */
  images?: Record<TemplateName, string>;
  /** In PostgreSQL server mode: the server URL and the template database names. */
  server?: { url: string; databases: Record<TemplateName, string> };
}

async function prepare(handle: DatabaseHandle, name: TemplateName) {
  await migrateDatabase(handle);
  if (name === 'demo') await seedDemo(handle.db);
}

/** Builds the migrated templates once per test run: in PGlite images, or on a PostgreSQL server. */
export async function buildTemplates(serverUrl?: string): Promise<TemplateLocations> {
  const names: TemplateName[] = ['empty', 'demo'];
  if (serverUrl) {
    const admin = new pg.Client({ connectionString: serverUrl });
    await admin.connect();
    const databases = {} as Record<TemplateName, string>;
    try {
      for (const name of names) {
        const database = `tutti_template_${name}`;
        await admin.query(`DROP DATABASE IF EXISTS ${database}`);
        await admin.query(`CREATE DATABASE ${database}`);
        const handle = await openDatabase({
          kind: 'postgres',
          url: withDatabase(serverUrl, database),
        });
        try {
          await prepare(handle, name);
        } finally {
          await handle.close();
        }
        databases[name] = database;
      }
    } finally {
      await admin.end();
    }
    return { server: { url: serverUrl, databases } };
  }
  const folder = fs.mkdtempSync(path.join(os.tmpdir(), 'tutti-templates-'));
  const images = {} as Record<TemplateName, string>;
  for (const name of names) {
    const handle = await openDatabase({ kind: 'pglite-memory' });
    try {
      await prepare(handle, name);
      const image = await handle.pglite!.dumpDataDir('none');
      images[name] = path.join(folder, `${name}.tar`);
      fs.writeFileSync(images[name], Buffer.from(await image.arrayBuffer()));
    } finally {
      await handle.close();
    }
  }
  return { images };
}

/** The same server URL pointing at another database. */
export function withDatabase(url: string, database: string): string {
  const parsed = new URL(url);
  parsed.pathname = `/${database}`;
  return parsed.href;
}

let counter = 0;

/** A fresh database for one test: a PGlite loaded from the image, or a copy of the template database. */
export async function openFromTemplate(
  locations: TemplateLocations,
  name: TemplateName,
): Promise<DatabaseHandle> {
  if (locations.server) {
    const database = `tutti_test_${process.pid}_${Date.now()}_${(counter += 1)}`;
    const admin = new pg.Client({ connectionString: locations.server.url });
    await admin.connect();
    try {
      await admin.query(`CREATE DATABASE ${database} TEMPLATE ${locations.server.databases[name]}`);
    } finally {
      await admin.end();
    }
    const handle = await openDatabase({
      kind: 'postgres',
      url: withDatabase(locations.server.url, database),
    });
    return {
      ...handle,
      close: async () => {
        await handle.close();
        const cleanup = new pg.Client({ connectionString: locations.server!.url });
        await cleanup.connect();
        await cleanup
          .query(`DROP DATABASE IF EXISTS ${database} WITH (FORCE)`)
          .catch(() => undefined);
        await cleanup.end();
      },
    };
  }
  const bytes = fs.readFileSync(locations.images![name]);
  return openDatabase({ kind: 'pglite-image', image: new Blob([new Uint8Array(bytes)]) });
}
