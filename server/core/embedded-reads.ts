import type { Request, Response } from 'express';
import {
  embeddedReadsId,
  pagesAfter,
  type EmbeddedRead,
  type ScreenRead,
} from '@shared/api/entry-reads';
import { getActiveLadder } from '../ladder/ladder-service';
import { listAttainment } from '../analytics/attainment-lists';
import { getDistrict } from '../district/district-service';
import { getEnsemble } from '../ensembles/ensembles-service';
import { listEnsembles } from '../ensembles/ensembles-queries';
import { describeMe } from '../me/me-service';
import { listPassOffs } from '../pass-offs/pass-offs-service';
import { loadActor } from '../people/people-queries';
import { listSchoolYears } from '../school-years/school-years-service';
import type { SessionUser } from '../auth/oidc-sign-in';
import type { Database } from '../db/client';
import type { Logger } from '../logger';
import { HttpError } from './errors';
import { can, type Actor, type Capability } from './policy';

type Query = Record<string, string>;

/**
 * The API reads a page may carry, each with the capabilities its route asks for (any one of
 * them; none: any signed-in user) and the service call the route makes, so the answer and the
 * rules are the API's own.
 */
const readers: readonly {
  path: RegExp;
  needs: readonly Capability[];
  read: (db: Database, actor: Actor, query: Query, match: RegExpExecArray) => Promise<unknown>;
}[] = [
  { path: /^\/api\/me$/, needs: [], read: (db, actor) => describeMe(db, actor) },
  { path: /^\/api\/district$/, needs: [], read: (db) => getDistrict(db) },
  { path: /^\/api\/school-years$/, needs: [], read: (db) => listSchoolYears(db) },
  { path: /^\/api\/ensembles$/, needs: ['roster:read'], read: listEnsembles },
  {
    path: /^\/api\/ensembles\/(\d+)$/,
    needs: ['roster:read'],
    read: (db, actor, _query, match) => getEnsemble(db, actor, Number(match[1])),
  },
  { path: /^\/api\/ladder$/, needs: ['ladder:read'], read: (db) => getActiveLadder(db) },
  { path: /^\/api\/pass-offs$/, needs: ['pass-offs:read', 'self:read'], read: listPassOffs },
  { path: /^\/api\/analytics\/students$/, needs: ['pass-offs:read'], read: listAttainment },
];

/**
 * The API's answer to one read for this actor, or undefined when the API would not answer it
 * 200 (no such route, a capability missing, a record the actor may not see, a bad parameter):
 * the web app then asks the API itself and gets its refusal.
 */
async function answer(db: Database, actor: Actor, read: ScreenRead): Promise<unknown> {
  for (const reader of readers) {
    const match = reader.path.exec(read.url);
    if (!match) continue;
    if (reader.needs.length && !reader.needs.some((capability) => can(actor, capability)))
      return undefined;
    const query = Object.fromEntries(
      Object.entries(read.params ?? {}).map(([name, value]) => [name, String(value)]),
    );
    try {
      return await reader.read(db, actor, query, match);
    } catch (error) {
      if (error instanceof HttpError) return undefined;
      throw error;
    }
  }
  return undefined;
}

/** The answers to the reads, and to the pages after each paged one's first, that the API gives. */
export async function embeddedReads(
  db: Database,
  actor: Actor,
  reads: readonly ScreenRead[],
): Promise<EmbeddedRead[]> {
  const bodies = await Promise.all(reads.map((read) => answer(db, actor, read)));
  const answered = await Promise.all(
    reads.map(async (read, index): Promise<EmbeddedRead[]> => {
      const body = bodies[index];
      if (body === undefined) return [];
      const pages = read.paged ? await embeddedReads(db, actor, pagesAfter(read, body)) : [];
      return [{ url: read.url, ...(read.params && { params: read.params }), body }, ...pages];
    }),
  );
  return answered.flat();
}

/** The signed-in user of a browser's session (not a bearer token), or null. */
export async function sessionActor(db: Database, request: Request): Promise<Actor | null> {
  const user = request.user as SessionUser | undefined;
  if (!user?.userId) return null;
  return (await loadActor(db, user.userId, 'session')) ?? null;
}

/**
 * The answers as a data block (HTML Living Standard, "Data blocks": a `script` whose type is not
 * JavaScript's is not run). `<` is written as its JSON escape so no text in the answers can close
 * the element (the standard's "Restrictions for contents of script elements").
 */
export function embeddedReadsBlock(reads: readonly EmbeddedRead[]): string {
  const json = JSON.stringify(reads).replace(/</g, '\\u003c');
  return `<script type="application/json" id="${embeddedReadsId}">${json}</script>`;
}

/**
 * Sends the index page with the answers read for it: everything before `</body>` at once (the
 * styles, scripts and preloads the browser fetches meanwhile; `flush` is the compression
 * middleware's), then the data block and the rest once the answers are read. Not stored by any
 * cache (RFC 9111 §5.2.2.5, no-store): it holds the user's own data.
 */
export async function sendWithEmbeddedReads(
  response: Response,
  indexHtml: string,
  reads: () => Promise<EmbeddedRead[]>,
  logger: Logger,
): Promise<void> {
  const end = indexHtml.lastIndexOf('</body>');
  response.set('Cache-Control', 'no-store');
  response.type('html');
  response.write(indexHtml.slice(0, end));
  (response as Response & { flush?: () => void }).flush?.();
  let answered: EmbeddedRead[] = [];
  try {
    answered = await reads();
  } catch (error) {
    // The page is on its way: the web app asks the API for what the page does not carry.
    logger.warn({ err: error }, 'The answers for the index page could not be read');
  }
  response.end(embeddedReadsBlock(answered) + indexHtml.slice(end));
}
