import Papa from 'papaparse';

/** Where and how to reach a OneRoster REST provider. */
export interface ProviderAccess {
  baseUrl: string;
  apiVersion: '1.1' | '1.2';
  tokenUrl: string;
  clientId: string;
  clientSecret: string;
}

/** A sync that could not fetch the roster: the reason, never holding the secret. */
export class SyncError extends Error {}

/** The roster fetched, as the files of a OneRoster 1.2 CSV bundle, and its newest change. */
export interface FetchedRoster {
  files: Map<string, string>;
  newest: Date | null;
  records: number;
}

type Json = Record<string, unknown>;
const pageSize = 100;

function refId(value: unknown): string {
  return value && typeof value === 'object' && 'sourcedId' in value
    ? String((value as { sourcedId: unknown }).sourcedId ?? '')
    : '';
}

function text(value: unknown): string {
  if (value === null || value === undefined) return '';
  if (Array.isArray(value)) return value.map(text).join(',');
  return String(value);
}

/** A CSV column read as the text of a record's field. */
const textOf = (field: string) => (record: Json) => text(record[field]);

/** A CSV column read as the sourcedId a record's field refers to. */
const refOf = (field: string) => (record: Json) => refId(record[field]);

// 1EdTech OneRoster 1.1 and 1.2 REST bindings (from memory): the 1.2 rostering service's base is
// /ims/oneroster/rostering/v1p2, 1.1's /ims/oneroster/v1p1.
function servicePath(access: ProviderAccess): string {
  const base = access.baseUrl.replace(/\/+$/, '');
  if (base.includes('/ims/oneroster')) return base;
  return access.apiVersion === '1.2'
    ? `${base}/ims/oneroster/rostering/v1p2`
    : `${base}/ims/oneroster/v1p1`;
}

async function send(url: string, init: RequestInit, timeoutMs: number, what: string) {
  try {
    return await fetch(url, { ...init, signal: AbortSignal.timeout(timeoutMs), redirect: 'error' });
  } catch (error) {
    const name = (error as Error).name;
    if (name === 'TimeoutError' || name === 'AbortError')
      throw new SyncError(`${what} did not answer within ${Math.round(timeoutMs / 1000)} s.`);
    const cause = (error as { cause?: { code?: string } }).cause?.code;
    throw new SyncError(`${what} could not be reached${cause ? ` (${cause})` : ''}.`);
  }
}

async function jsonOf(response: Response, what: string): Promise<Json> {
  const body = await response.text();
  try {
    const parsed: unknown = JSON.parse(body);
    if (parsed && typeof parsed === 'object' && !Array.isArray(parsed)) return parsed as Json;
  } catch {
    // reported below
  }
  throw new SyncError(`${what} answered with something that is not a JSON object.`);
}

// RFC 6749 §4.4: client credentials grant, the client authenticated with HTTP Basic (§2.3.1).
async function accessToken(access: ProviderAccess, timeoutMs: number): Promise<string> {
  const basic = Buffer.from(
    `${encodeURIComponent(access.clientId)}:${encodeURIComponent(access.clientSecret)}`,
  ).toString('base64');
  const response = await send(
    access.tokenUrl,
    {
      method: 'POST',
      headers: {
        Authorization: `Basic ${basic}`,
        'Content-Type': 'application/x-www-form-urlencoded',
        Accept: 'application/json',
      },
      body: new URLSearchParams({ grant_type: 'client_credentials' }).toString(),
    },
    timeoutMs,
    'The token endpoint',
  );
  if (response.status === 400 || response.status === 401)
    throw new SyncError(
      `The token endpoint refused the client (${response.status}); check the client id and secret.`,
    );
  if (!response.ok) throw new SyncError(`The token endpoint answered ${response.status}.`);
  const body = await jsonOf(response, 'The token endpoint');
  if (typeof body['access_token'] !== 'string' || body['access_token'] === '')
    throw new SyncError('The token endpoint gave no access token.');
  return body['access_token'];
}

/**
 * Fetches the roster from a OneRoster REST provider: an OAuth 2 client-credentials token, then
 * orgs, users, classes and enrollments page by page (`limit`, `offset`, the `X-Total-Count`
 * header). With `changedSince`, users and enrollments are asked for with
 * `filter=dateLastModified>'…'` (changes only; orgs and classes whole, being few), and a user an
 * enrolment names but the changes leave out is fetched by its sourcedId. The answer is written
 * as a OneRoster 1.2 CSV bundle, so it is read exactly as an uploaded one.
 */
export async function fetchRoster(
  access: ProviderAccess,
  changedSince: Date | null,
  timeoutMs = 20_000,
): Promise<FetchedRoster> {
  const token = await accessToken(access, timeoutMs);
  const service = servicePath(access);
  const headers = { Authorization: `Bearer ${token}`, Accept: 'application/json' };
  const get = async (path: string, query: Record<string, string>): Promise<Response> => {
    const url = `${service}/${path}${Object.keys(query).length > 0 ? `?${new URLSearchParams(query)}` : ''}`;
    const what = `The provider's ${path.split('/')[0]} page`;
    const response = await send(url, { headers }, timeoutMs, what);
    if (response.status === 401 || response.status === 403)
      throw new SyncError(
        `The provider refused the access token (${response.status}) for ${path}.`,
      );
    return response;
  };
  const all = async (collection: string, filter?: string): Promise<Json[]> => {
    const found: Json[] = [];
    for (let offset = 0; ;) {
      const query: Record<string, string> = { limit: String(pageSize), offset: String(offset) };
      if (filter) query['filter'] = filter;
      const response = await get(collection, query);
      if (!response.ok)
        throw new SyncError(`The provider answered ${response.status} for ${collection}.`);
      const body = await jsonOf(response, `The provider's ${collection} page`);
      const page = body[collection];
      if (!Array.isArray(page))
        throw new SyncError(`The provider's ${collection} page holds no '${collection}' list.`);
      found.push(...(page as Json[]));
      offset += page.length;
      const total = Number(response.headers.get('x-total-count'));
      if (page.length === 0 || (Number.isFinite(total) && offset >= total)) break;
      if (!response.headers.has('x-total-count') && page.length < pageSize) break;
    }
    return found;
  };
  const since = changedSince ? `dateLastModified>'${changedSince.toISOString()}'` : undefined;
  const orgs = await all('orgs');
  const classes = await all('classes');
  const users = await all('users', since);
  const enrollments = await all('enrollments', since);
  if (since) {
    const known = new Set(users.map((user) => String(user['sourcedId'])));
    for (const id of new Set(enrollments.map((entry) => refId(entry['user'])))) {
      if (!id || known.has(id)) continue;
      const response = await get(`users/${encodeURIComponent(id)}`, {});
      if (response.status === 404) continue;
      if (!response.ok) throw new SyncError(`The provider answered ${response.status} for a user.`);
      const body = await jsonOf(response, "The provider's user");
      if (body['user'] && typeof body['user'] === 'object') users.push(body['user'] as Json);
      known.add(id);
    }
  }
  return asBundle({ orgs, users, classes, enrollments }, access.apiVersion, since !== undefined);
}

/** Rows as one CSV file of the bundle (RFC 4180 line ends). */
function csv(rows: Record<string, string>[], fields: string[]): string {
  return Papa.unparse(
    { fields, data: rows.map((row) => fields.map((field) => row[field] ?? '')) },
    {
      newline: '\r\n',
    },
  );
}

type BaseColumns = { sourcedId: string; status: string; dateLastModified: string };

/** The columns every record has; `newest()` is the latest `dateLastModified` read so far. */
function baseColumns() {
  let newest: Date | null = null;
  const base = (record: Json): BaseColumns => {
    const modified = text(record['dateLastModified']);
    const time = Date.parse(modified);
    if (!Number.isNaN(time) && (!newest || time > newest.getTime())) newest = new Date(time);
    return {
      sourcedId: text(record['sourcedId']),
      status: text(record['status']) || 'active',
      dateLastModified: modified,
    };
  };
  return { base, newest: () => newest };
}

/** The users as rows of users.csv, and their roles as rows of roles.csv. */
function userAndRoleRows(users: Json[], base: (record: Json) => BaseColumns) {
  const roles: Record<string, string>[] = [];
  const rows = users.map((user) => {
    const row = base(user);
    // 1.2 users carry roles [{ roleType, role, org }] and primaryOrg; 1.1 users a role and orgs.
    const userRoles = Array.isArray(user['roles'])
      ? (user['roles'] as Json[]).map((entry) => ({
          roleType: text(entry['roleType']) || 'primary',
          role: text(entry['role']),
          org: refId(entry['org']),
        }))
      : (Array.isArray(user['orgs']) ? (user['orgs'] as Json[]) : []).map((org, index) => ({
          roleType: index === 0 ? 'primary' : 'secondary',
          role: text(user['role']),
          org: refId(org),
        }));
    userRoles.forEach((entry, index) =>
      roles.push({
        sourcedId: `${row.sourcedId}#${index + 1}`,
        status: row.status,
        dateLastModified: row.dateLastModified,
        userSourcedId: row.sourcedId,
        roleType: entry.roleType,
        role: entry.role,
        orgSourcedId: entry.org,
      }),
    );
    return {
      ...row,
      enabledUser: text(user['enabledUser']),
      username: text(user['username']),
      givenName: text(user['givenName']),
      familyName: text(user['familyName']),
      identifier: text(user['identifier']),
      userMasterIdentifier: text(user['userMasterIdentifier']),
      email: text(user['email']),
      agentSourcedIds: (Array.isArray(user['agents']) ? (user['agents'] as Json[]) : [])
        .map(refId)
        .join(','),
      grades: text(user['grades']),
      preferredFirstName: text(user['preferredFirstName']),
      primaryOrgSourcedId: refId(user['primaryOrg']),
    };
  });
  return { users: rows, roles };
}

/** manifest.csv: orgs and classes whole, the people and their seats whole or as a delta. */
function manifestCsv(apiVersion: '1.1' | '1.2', delta: boolean): string {
  const mode = delta ? 'delta' : 'bulk';
  return csv(
    [
      { propertyName: 'manifest.version', value: '1.0' },
      { propertyName: 'oneroster.version', value: '1.2' },
      { propertyName: 'file.orgs', value: 'bulk' },
      { propertyName: 'file.classes', value: 'bulk' },
      { propertyName: 'file.users', value: mode },
      { propertyName: 'file.roles', value: mode },
      { propertyName: 'file.enrollments', value: mode },
      { propertyName: 'source.systemName', value: `OneRoster ${apiVersion} REST` },
    ],
    ['propertyName', 'value'],
  );
}

/** The roster's JSON records as the files of a OneRoster 1.2 CSV bundle. */
export function asBundle(
  roster: { orgs: Json[]; users: Json[]; classes: Json[]; enrollments: Json[] },
  apiVersion: '1.1' | '1.2',
  delta: boolean,
): FetchedRoster {
  const { base, newest } = baseColumns();
  const { users, roles } = userAndRoleRows(roster.users, base);
  const files = new Map<string, string>();
  files.set('manifest.csv', manifestCsv(apiVersion, delta));
  const common = ['sourcedId', 'status', 'dateLastModified'];
  /** One file's rows: the common columns, then each column read from the record by `columns`. */
  const recordsCsv = (records: Json[], columns: Record<string, (record: Json) => string>) =>
    csv(
      records.map((record) => ({
        ...base(record),
        ...Object.fromEntries(Object.entries(columns).map(([name, read]) => [name, read(record)])),
      })),
      [...common, ...Object.keys(columns)],
    );
  files.set(
    'orgs.csv',
    recordsCsv(roster.orgs, {
      name: textOf('name'),
      type: textOf('type'),
      identifier: textOf('identifier'),
      parentSourcedId: refOf('parent'),
    }),
  );
  files.set(
    'users.csv',
    csv(users, [
      ...common,
      'enabledUser',
      'username',
      'givenName',
      'familyName',
      'identifier',
      'email',
      'agentSourcedIds',
      'grades',
      'userMasterIdentifier',
      'preferredFirstName',
      'primaryOrgSourcedId',
    ]),
  );
  files.set(
    'roles.csv',
    csv(roles, [...common, 'userSourcedId', 'roleType', 'role', 'orgSourcedId']),
  );
  files.set(
    'classes.csv',
    recordsCsv(roster.classes, {
      title: textOf('title'),
      classCode: textOf('classCode'),
      schoolSourcedId: refOf('school'),
      subjects: textOf('subjects'),
    }),
  );
  files.set(
    'enrollments.csv',
    recordsCsv(roster.enrollments, {
      classSourcedId: refOf('class'),
      schoolSourcedId: refOf('school'),
      userSourcedId: refOf('user'),
      role: textOf('role'),
      primary: textOf('primary'),
    }),
  );
  const records =
    roster.orgs.length + roster.users.length + roster.classes.length + roster.enrollments.length;
  return { files, newest: newest(), records };
}
