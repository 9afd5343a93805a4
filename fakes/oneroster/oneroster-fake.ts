import { randomBytes } from 'node:crypto';
import { createServer, type Server } from 'node:http';
import type { AddressInfo } from 'node:net';
import express, { type Request, type Response } from 'express';
import { demoRoster, type RosterData, type User } from './roster-data.js';

/** How to start the OneRoster REST provider fake. */
export interface OneRosterFakeOptions {
  /** Port on 127.0.0.1; 0 picks a free one. Defaults to 4313. */
  port?: number;
  clientId?: string;
  clientSecret?: string;
  /** The roster it serves; the demo district's small roster by default. */
  roster?: RosterData;
}

type Collection = keyof RosterData;

/** What the next rostering request meets instead of an answer. */
export type Trouble = 'unavailable' | 'not-json' | 'slow' | 'unauthorized';

/** A running fake. */
export interface OneRosterFake {
  /** The provider's base address, such as `http://127.0.0.1:4313` (the sync's base URL). */
  url: string;
  /** Its OAuth 2 token endpoint. */
  tokenUrl: string;
  clientId: string;
  clientSecret: string;
  /** The roster it serves, to read or change in place (then call `touch`). */
  roster: RosterData;
  /** Marks a record changed now, with optional new fields, as a provider does on every edit. */
  touch<Name extends Collection>(
    collection: Name,
    sourcedId: string,
    change?: Partial<RosterData[Name][number]>,
  ): void;
  /** Adds a record, changed now. */
  add<Name extends Collection>(collection: Name, record: RosterData[Name][number]): void;
  /** Makes the next rostering requests fail this way, `times` times. */
  trouble(kind: Trouble, times?: number): void;
  /** The rostering requests served so far (path and query). */
  requests(): string[];
  close(): Promise<void>;
}

// 1EdTech OneRoster 1.1 and 1.2 REST bindings (from memory): the 1.2 rostering service lives at
// /ims/oneroster/rostering/v1p2/, 1.1's at /ims/oneroster/v1p1/; a collection answers
// `{ "<collection>": [...] }` with paging by `limit` (default 100) and `offset`, the total in
// the X-Total-Count header, and filters such as `dateLastModified>'2026-09-01T00:00:00Z'`.
const collections: readonly Collection[] = ['orgs', 'users', 'classes', 'enrollments'];
const defaultLimit = 100;

/** A 1.2 user as 1.1 shapes it: one `role` and its `orgs`. */
function asVersion11(user: User) {
  const { roles, primaryOrg, preferredFirstName: _preferred, ...rest } = user;
  const role =
    roles.find((entry) => entry.roleType === 'primary')?.role ?? roles[0]?.role ?? 'student';
  const orgs = [primaryOrg, ...roles.map((entry) => entry.org)].filter(
    (org, index, all): org is NonNullable<typeof org> =>
      org !== null && all.findIndex((other) => other?.sourcedId === org.sourcedId) === index,
  );
  return { ...rest, role, orgs };
}

/** The records a `filter` keeps: only dateLastModified comparisons are understood. */
function filtered<Item extends { dateLastModified: string }>(
  items: Item[],
  filter: string | undefined,
): Item[] | string {
  if (!filter) return items;
  const match = /^dateLastModified\s*(>=|>|<=|<|=)\s*'([^']+)'$/.exec(filter.trim());
  if (!match) return `The filter '${filter}' is not one this provider understands.`;
  const [, operator, value] = match;
  const bound = Date.parse(value!);
  if (Number.isNaN(bound)) return `'${value}' is not a date.`;
  return items.filter((item) => {
    const time = Date.parse(item.dateLastModified);
    if (operator === '>') return time > bound;
    if (operator === '>=') return time >= bound;
    if (operator === '<') return time < bound;
    if (operator === '<=') return time <= bound;
    return time === bound;
  });
}

function failure(response: Response, status: number, description: string) {
  response.status(status).json({
    imsx_codeMajor: 'failure',
    imsx_severity: 'error',
    imsx_description: description,
  });
}

/**
 * The token endpoint: RFC 6749 §4.4 (client credentials grant) and §2.3.1 (client password in
 * HTTP Basic or the request body).
 */
function issueToken(clientId: string, clientSecret: string, tokens: Set<string>) {
  return (request: Request, response: Response) => {
    let id = request.body?.client_id as string | undefined;
    let secret = request.body?.client_secret as string | undefined;
    const basic = /^Basic (.+)$/i.exec(request.headers.authorization ?? '');
    if (basic) {
      const [user, ...password] = Buffer.from(basic[1]!, 'base64').toString('utf8').split(':');
      id = decodeURIComponent(user ?? '');
      secret = decodeURIComponent(password.join(':'));
    }
    if (request.body?.grant_type !== 'client_credentials') {
      response.status(400).json({ error: 'unsupported_grant_type' });
      return;
    }
    if (id !== clientId || secret !== clientSecret) {
      response.status(401).json({ error: 'invalid_client' });
      return;
    }
    const token = randomBytes(24).toString('base64url');
    tokens.add(token);
    response.set('Cache-Control', 'no-store').json({
      access_token: token,
      token_type: 'Bearer',
      expires_in: 3600,
      scope: 'https://purl.imsglobal.org/spec/or/v1p2/scope/roster-core.readonly',
    });
  };
}

/** Answers with the trouble a test asked for; false for a kind that answers normally. */
function answeredWithTrouble(kind: Trouble, collection: Collection, response: Response): boolean {
  if (kind === 'unavailable') {
    failure(response, 503, 'The provider is down for upkeep.');
    return true;
  }
  if (kind === 'unauthorized') {
    failure(response, 401, 'The token is not valid.');
    return true;
  }
  if (kind === 'not-json') {
    response.status(200).type('text/html').send('<html><body>Maintenance</body></html>');
    return true;
  }
  if (kind === 'slow') {
    setTimeout(() => response.headersSent || response.json({ [collection]: [] }), 30_000).unref();
    return true;
  }
  return false;
}

/** Whether the request carries one of the tokens this provider issued. */
function hasToken(request: Request, tokens: Set<string>): boolean {
  const bearer = /^Bearer (.+)$/i.exec(request.headers.authorization ?? '');
  return bearer !== null && tokens.has(bearer[1]!);
}

/** One user by sourcedId (`users/{sourcedId}`), in the version's shape. */
function oneUser(
  version: '1.1' | '1.2',
  roster: RosterData,
  tokens: Set<string>,
  served: string[],
) {
  return (request: Request, response: Response) => {
    served.push(request.originalUrl);
    if (!hasToken(request, tokens)) return failure(response, 401, 'A bearer token is required.');
    const user = roster.users.find((item) => item.sourcedId === request.params['sourcedId']);
    if (!user) return failure(response, 404, 'No such user.');
    response.json({ user: version === '1.1' ? asVersion11(user) : user });
  };
}

/** Starts a local OneRoster REST provider with OAuth 2 client-credentials tokens. */
export async function startOneRosterFake(
  options: OneRosterFakeOptions = {},
): Promise<OneRosterFake> {
  const clientId = options.clientId ?? 'tutti-sync';
  const clientSecret = options.clientSecret ?? `or-secret-${randomBytes(12).toString('hex')}`;
  const roster = options.roster ?? demoRoster();
  const tokens = new Set<string>();
  const served: string[] = [];
  let pending: { kind: Trouble; times: number } | undefined;

  const app = express();
  app.disable('x-powered-by');
  app.use(express.urlencoded({ extended: false }));

  app.post('/oauth/token', issueToken(clientId, clientSecret, tokens));

  const serve = (version: '1.1' | '1.2') => (request: Request, response: Response) => {
    const collection = request.params['collection'] as Collection;
    if (!collections.includes(collection)) return failure(response, 404, 'No such collection.');
    served.push(request.originalUrl);
    if (pending && pending.times > 0) {
      const { kind } = pending;
      pending.times -= 1;
      if (answeredWithTrouble(kind, collection, response)) return;
    }
    if (!hasToken(request, tokens)) return failure(response, 401, 'A bearer token is required.');
    const limit = Number(request.query['limit'] ?? defaultLimit);
    const offset = Number(request.query['offset'] ?? 0);
    if (!Number.isInteger(limit) || limit < 1 || !Number.isInteger(offset) || offset < 0)
      return failure(response, 400, 'limit and offset are whole numbers.');
    const kept = filtered(
      roster[collection] as { dateLastModified: string }[],
      request.query['filter'] as string | undefined,
    );
    if (typeof kept === 'string') return failure(response, 400, kept);
    const page = kept
      .slice(offset, offset + limit)
      .map((item) =>
        version === '1.1' && collection === 'users' ? asVersion11(item as User) : item,
      );
    response.set('X-Total-Count', String(kept.length)).json({ [collection]: page });
  };
  app.get('/ims/oneroster/rostering/v1p2/users/:sourcedId', oneUser('1.2', roster, tokens, served));
  app.get('/ims/oneroster/v1p1/users/:sourcedId', oneUser('1.1', roster, tokens, served));
  app.get('/ims/oneroster/rostering/v1p2/:collection', serve('1.2'));
  app.get('/ims/oneroster/v1p1/:collection', serve('1.1'));

  const server: Server = createServer(app);
  await new Promise<void>((resolve) => server.listen(options.port ?? 4313, '127.0.0.1', resolve));
  const url = `http://127.0.0.1:${(server.address() as AddressInfo).port}`;
  return {
    url,
    tokenUrl: `${url}/oauth/token`,
    clientId,
    clientSecret,
    roster,
    touch(collection, sourcedId, change = {}) {
      const list = roster[collection] as { sourcedId: string; dateLastModified: string }[];
      const record = list.find((item) => item.sourcedId === sourcedId);
      if (!record) throw new Error(`No ${collection} record '${sourcedId}'.`);
      Object.assign(record, change, { dateLastModified: new Date().toISOString() });
    },
    add(collection, record) {
      (roster[collection] as unknown[]).push({
        ...record,
        dateLastModified: new Date().toISOString(),
      });
    },
    trouble(kind, times = 1) {
      pending = { kind, times };
    },
    requests: () => [...served],
    close: () =>
      new Promise<void>((resolve) => {
        server.closeAllConnections();
        server.close(() => resolve());
      }),
  };
}
