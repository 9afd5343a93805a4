import { describe, expect, it } from 'vitest';
import { embeddedEntryReads, type ScreenRead } from '@shared/api/entry-reads';
import { parse, type DefaultTreeAdapterMap } from 'parse5';
import { embeddedReads, embeddedReadsBlock } from '../../server/core/embedded-reads';
import { loadActor } from '../../server/people/people-queries';
import { useTestApp, type SignedInClient } from '../support/test-app';

const app = useTestApp({
  signIn: ['director.hpms', 'director.qhms', 'viewer.trhs', 'student.hpms'],
});
const { clients } = app;

/** The address the web app asks for a read at. */
function addressOf(read: ScreenRead): string {
  const params = Object.entries(read.params ?? {}).map(([name, value]) => [name, String(value)]);
  return params.length ? `${read.url}?${new URLSearchParams(params).toString()}` : read.url;
}

/** What the page would carry for the signed-in user of `client`, read the page's way. */
async function embeddedFor(client: SignedInClient, ensembleId: number | null) {
  const me = (await client.get('/api/me')).body as { id: number };
  const actor = await loadActor(app.database.db, me.id, 'session');
  return embeddedReads(app.database.db, actor!, embeddedEntryReads(ensembleId));
}

/**
 * Each read the page may carry, asked of the API by the same user: the page carries it exactly
 * when the API answers 200, with the same body; the pages after a list's first are carried as the
 * first's `total` implies, each the API's own answer.
 */
async function expectSameAsApi(client: SignedInClient, ensembleId: number | null) {
  const embedded = await embeddedFor(client, ensembleId);
  const carried = new Map(embedded.map((read) => [addressOf(read), read.body]));
  for (const read of embeddedEntryReads(ensembleId)) {
    const response = await client.get(addressOf(read));
    expect(carried.has(addressOf(read)), addressOf(read)).toBe(response.status === 200);
    if (response.status === 200) expect(carried.get(addressOf(read))).toEqual(response.body);
  }
  for (const read of embedded) {
    const response = await client.get(addressOf(read));
    expect(response.status, addressOf(read)).toBe(200);
    expect(read.body).toEqual(response.body);
  }
  return embedded;
}

async function firstEnsembleOf(client: SignedInClient): Promise<number> {
  const rows = (await client.get('/api/ensembles?sort=name:asc&limit=1')).body.rows as {
    id: number;
  }[];
  return rows[0]!.id;
}

describe('the answers the pass-off page is served with', () => {
  it("should carry a director's reads as the API answers them, every page of the pass-offs", async () => {
    const director = clients['director.hpms'];
    const ensembleId = await firstEnsembleOf(director);
    const embedded = await expectSameAsApi(director, ensembleId);
    const passOffPages = embedded.filter((read) => read.url === '/api/pass-offs');
    const total = (passOffPages[0]!.body as { total: number }).total;
    // The demo's first ensemble has more pass-offs than one page holds (1,000 rows a page).
    expect(total).toBeGreaterThan(1000);
    expect(passOffPages.length).toBe(Math.ceil(total / 1000));
    expect(embedded.map((read) => read.url)).toContain('/api/me');
  });

  it("should leave out what the API refuses: another school's ensemble, a student's roster reads", async () => {
    const ensembleId = await firstEnsembleOf(clients['director.hpms']);
    const other = await expectSameAsApi(clients['director.qhms'], ensembleId);
    expect(other.map((read) => read.url)).not.toContain(`/api/ensembles/${ensembleId}`);
    const student = await expectSameAsApi(clients['student.hpms'], ensembleId);
    expect(student.map((read) => read.url)).not.toContain('/api/ensembles');
    expect(student.map((read) => read.url)).not.toContain('/api/analytics/students');
    await expectSameAsApi(clients['viewer.trhs'], ensembleId);
  });

  it('should leave out the ensemble reads for an ensemble that does not exist', async () => {
    const embedded = await expectSameAsApi(clients['director.hpms'], 987_654);
    expect(embedded.map((read) => read.url)).not.toContain('/api/ensembles/987654');
  });

  it('should keep any text in the answers inside its data block', () => {
    const name = '</script><script>alert(1)</script><!-- <script>';
    const reads = [{ url: '/api/me', body: { name } }];
    const html = `<!doctype html><html><head></head><body>${embeddedReadsBlock(reads)}</body></html>`;
    // parse5, an implementation of the HTML Living Standard's parsing algorithm, finds one
    // script element whose text is the JSON of the answers as given.
    const scripts: DefaultTreeAdapterMap['element'][] = [];
    const walk = (node: DefaultTreeAdapterMap['node']) => {
      if ('tagName' in node && node.tagName === 'script') scripts.push(node);
      if ('childNodes' in node) node.childNodes.forEach(walk);
    };
    walk(parse(html));
    expect(scripts).toHaveLength(1);
    const text = scripts[0]!.childNodes
      .map((child) => ('value' in child ? child.value : ''))
      .join('');
    expect(JSON.parse(text)).toEqual(reads);
  });
});
