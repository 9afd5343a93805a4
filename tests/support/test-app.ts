import { createHttpServer } from '../../server/core/http-server';
import fs from 'node:fs';
import os from 'node:os';
import path from 'node:path';
import type { AddressInfo } from 'node:net';
import { afterAll, beforeAll, expect, inject } from 'vitest';
import request from 'supertest';
import { createApp } from '../../server/app';
import { loadConfig, type Config } from '../../server/config';
import type { DatabaseHandle } from '../../server/db/client';
import { createLogger, type Logger } from '../../server/logger';
import { findUserByEmail } from '../../server/people/people-queries';
import { issueToken } from '../../server/tokens/tokens-service';
import { CookieJar, startOidcFake, walkSignIn, type OidcFake } from '../../fakes/oidc/index';
import { startMailFake, type MailFake } from '../../fakes/mail/index';
import { startPaymentsFake, type PaymentsFake } from '../../fakes/payments/index';
import { startOneRosterFake, type OneRosterFake } from '../../fakes/oneroster/index';
import { schools } from '../../server/db/schema/index';
import { openFromTemplate, type TemplateName } from './database-templates';

/** A signed-in browser: its cookies, and requests that carry them with a same-site Origin. */
export interface SignedInClient {
  jar: CookieJar;
  cookie: string;
  get(path: string): request.Test;
  post(path: string, body?: object): request.Test;
  patch(path: string, body?: object): request.Test;
  delete(path: string): request.Test;
  /**
   * A multipart/form-data POST (RFC 7578) as a browser's form sends it: the file's bytes in
   * `field`, named as `file` says (supertest's `.attach`), then the other form fields.
   */
  upload(
    path: string,
    field: string,
    bytes: Buffer,
    file: string | { filename: string; contentType?: string },
    fields?: Record<string, string>,
  ): request.Test;
}

/** A running app on an ephemeral port with its own database, identity provider and mail catcher. */
export interface TestApp {
  url: string;
  config: Config;
  database: DatabaseHandle;
  oidc: OidcFake;
  mail: MailFake;
  /** The payment-service fake (the app is pointed at it unless `payments: false`). */
  payments: PaymentsFake;
  /** The OneRoster REST provider fake, serving the demo district's small roster. */
  oneRoster: OneRosterFake;
  /** A plain client with no credentials. */
  anonymous: ReturnType<typeof request>;
  /** Signs in through the real identity provider over HTTP, as a browser would. */
  signIn(email: string): Promise<SignedInClient>;
  /** A fresh API token for the user. */
  token(email: string): Promise<string>;
  /** Requests with `Authorization: Bearer <token>`. */
  bearer(token: string): {
    get(path: string): request.Test;
    post(path: string, body?: object): request.Test;
    patch(path: string, body?: object): request.Test;
    delete(path: string): request.Test;
  };
  close(): Promise<void>;
}

/** A test app with the users a test file asked for already signed in. */
export interface StartedTestApp<Name extends string> extends TestApp {
  /** The signed-in clients by the local part of the user's demo e-mail (`'director.hpms'`). */
  clients: Record<Name, SignedInClient>;
  /** The database's schools: code → id. */
  schoolIds: Record<string, number>;
}

export const demoEmail = (local: string) => `${local}@merrowbasin.example`;

/** Demo users who between them hold every role, for tests that ask each role in turn. */
export const everyRole = [
  'coordinator',
  'director.hpms',
  'director.qhms',
  'viewer.trhs',
  'technician',
  'student.hpms',
] as const;

/** The clients of `everyRole` by role; `otherDirector` directs a school the student is not at. */
export function byRole(clients: Record<(typeof everyRole)[number], SignedInClient>) {
  return {
    coordinator: clients.coordinator,
    director: clients['director.hpms'],
    otherDirector: clients['director.qhms'],
    viewer: clients['viewer.trhs'],
    technician: clients.technician,
    student: clients['student.hpms'],
  };
}

/** The demo users of `everyRole` who are not the coordinator and not the second director. */
export const allButCoordinator = [
  'director.hpms',
  'viewer.trhs',
  'technician',
  'student.hpms',
] as const;

/**
 * Sends the requests `send` makes as each user of `allButCoordinator` and expects 403 to every
 * one of them (server/core/policy.ts: these routes are the coordinator's alone).
 */
export async function expectCoordinatorOnly(
  app: { clients: Record<(typeof allButCoordinator)[number], SignedInClient> },
  send: (client: SignedInClient) => PromiseLike<{ status: number }>[],
): Promise<void> {
  for (const local of allButCoordinator) {
    const answers = await Promise.all(send(app.clients[local]));
    expect(
      answers.map((answer) => answer.status),
      local,
    ).toEqual(answers.map(() => 403));
  }
}

/** How a test file's app starts: `startTestApp` and `useTestApp` take the same options. */
export interface TestAppOptions<Name extends string> {
  template?: TemplateName;
  serveWeb?: boolean;
  environment?: NodeJS.ProcessEnv;
  logger?: Logger;
  payments?: boolean;
  /** Demo users to sign in (by the local part of their e-mail), after `seed` has run. */
  signIn?: readonly Name[];
  /** Writes the test's own district into the database before anyone signs in. */
  seed?: (database: DatabaseHandle) => Promise<void>;
}

/**
 * Starts the whole app for a test file, from the demo district unless told otherwise, and signs
 * in the demo users named in `signIn` (each through the identity provider, as a browser would).
 */
export async function startTestApp<const Name extends string = never>(
  options: TestAppOptions<Name> = {},
): Promise<StartedTestApp<Name>> {
  const app = await startApp(options);
  await options.seed?.(app.database);
  const signedIn = await Promise.all(
    (options.signIn ?? []).map((name) => app.signIn(demoEmail(name))),
  );
  const schoolRows = await app.database.db
    .select({ id: schools.id, code: schools.code })
    .from(schools);
  return {
    ...app,
    clients: Object.fromEntries(
      (options.signIn ?? []).map((name, index) => [name, signedIn[index]!]),
    ) as Record<Name, SignedInClient>,
    schoolIds: Object.fromEntries(schoolRows.map((row) => [row.code, row.id])),
  };
}

/**
 * Starts the app before the file's tests and closes it after them; call it at the top of a test
 * file. What it returns reads the running app, so use it inside tests and hooks; its `clients`
 * may be taken apart at the top of the file, each one speaking for the signed-in user.
 */
export function useTestApp<const Name extends string = never>(
  options: TestAppOptions<Name> = {},
  startTimeoutMs?: number,
): Readonly<StartedTestApp<Name>> {
  let started: StartedTestApp<Name> | undefined;
  beforeAll(async () => {
    started = await startTestApp(options);
  }, startTimeoutMs);
  afterAll(() => started?.close());
  const running = (): StartedTestApp<Name> => {
    if (started === undefined)
      throw new Error('The test app starts in beforeAll; use it inside a test.');
    return started;
  };
  const clientOf = (name: Name): SignedInClient => ({
    get jar() {
      return running().clients[name].jar;
    },
    get cookie() {
      return running().clients[name].cookie;
    },
    get: (target) => running().clients[name].get(target),
    post: (target, body) => running().clients[name].post(target, body),
    patch: (target, body) => running().clients[name].patch(target, body),
    delete: (target) => running().clients[name].delete(target),
    upload: (...upload) => running().clients[name].upload(...upload),
  });
  const clients = Object.fromEntries(
    (options.signIn ?? []).map((name) => [name, clientOf(name)]),
  ) as Record<Name, SignedInClient>;
  /** The running app's fields, each read when a test asks for it. */
  const fields = [
    'schoolIds',
    'url',
    'config',
    'database',
    'oidc',
    'mail',
    'payments',
    'oneRoster',
    'anonymous',
  ] as const;
  const methods: Pick<TestApp, 'signIn' | 'token' | 'bearer' | 'close'> = {
    signIn: (email) => running().signIn(email),
    token: (email) => running().token(email),
    bearer: (token) => running().bearer(token),
    close: () => running().close(),
  };
  return Object.defineProperties(
    { clients, ...methods },
    Object.fromEntries(
      fields.map((field) => [field, { get: () => running()[field], enumerable: true }]),
    ),
  ) as Readonly<StartedTestApp<Name>>;
}

async function startApp(options: {
  template?: TemplateName;
  serveWeb?: boolean;
  environment?: NodeJS.ProcessEnv;
  logger?: Logger;
  payments?: boolean;
}): Promise<TestApp> {
  const templates = inject('templates');
  const [oidc, mail, payments, oneRoster, database] = await Promise.all([
    startOidcFake({ port: 0 }),
    startMailFake({ smtpPort: 0, httpPort: 0 }),
    startPaymentsFake({ port: 0, retryDelaysMs: [200, 500, 1000] }),
    startOneRosterFake({ port: 0 }),
    openFromTemplate(templates, options.template ?? 'demo'),
  ]);
  const dataDir = fs.mkdtempSync(path.join(os.tmpdir(), 'tutti-test-data-'));
  const config = loadConfig({
    TUTTI_DATA_DIR: dataDir,
    OIDC_ISSUER: oidc.issuer,
    SMTP_URL: mail.smtpUrl,
    LOG_LEVEL: 'silent',
    TUTTI_SECRET_KEY: 'test-secret-key-for-stored-secrets-0123456789',
    ...(options.payments === false
      ? {}
      : {
          PAYMENTS_SECRET_KEY: payments.secretKey,
          PAYMENTS_WEBHOOK_SECRET: payments.webhookSecret,
          PAYMENTS_API_URL: payments.url,
        }),
    ...options.environment,
  });
  const app = await createApp(config, {
    database,
    logger: options.logger ?? createLogger('silent'),
    serveWeb: options.serveWeb ?? false,
  });
  const server = createHttpServer(app);
  await new Promise<void>((resolve) => server.listen(0, '127.0.0.1', resolve));
  const url = `http://127.0.0.1:${(server.address() as AddressInfo).port}`;
  payments.setWebhookUrl(`${url}/api/payments/webhook`);

  const withHeaders = (headers: Record<string, string>) => {
    const agent = request(url);
    return {
      get: (target: string) => agent.get(target).set(headers),
      post: (target: string, body?: object) =>
        agent
          .post(target)
          .set(headers)
          .send(body ?? {}),
      patch: (target: string, body?: object) =>
        agent
          .patch(target)
          .set(headers)
          .send(body ?? {}),
      delete: (target: string) => agent.delete(target).set(headers),
      upload: (
        ...[target, field, bytes, file, fields = {}]: Parameters<SignedInClient['upload']>
      ) => {
        let call = agent.post(target).set(headers).attach(field, bytes, file);
        for (const [name, value] of Object.entries(fields)) call = call.field(name, value);
        return call;
      },
    };
  };

  return {
    url,
    config,
    database,
    oidc,
    mail,
    payments,
    oneRoster,
    anonymous: request(url),
    async signIn(email) {
      const jar = new CookieJar();
      const { callbackUrl } = await walkSignIn(`${url}/auth/sign-in`, email, jar);
      const landing = await jar.fetch(callbackUrl);
      if (landing.status !== 302)
        throw new Error(`Sign-in callback answered ${landing.status}: ${await landing.text()}`);
      const cookie = jar.header(url) ?? '';
      return { jar, cookie, ...withHeaders({ Cookie: cookie, Origin: url }) };
    },
    async token(email) {
      const user = await findUserByEmail(database.db, email);
      if (!user) throw new Error(`No user ${email} in the test database.`);
      return (await issueToken(database.db, user.id, 'test')).token;
    },
    bearer: (token) => withHeaders({ Authorization: `Bearer ${token}` }),
    async close() {
      await new Promise<void>((resolve) => {
        server.close(() => resolve());
        server.closeAllConnections();
      });
      await (app.locals['stop'] as () => Promise<void>)();
      // A test may have stopped a fake on purpose already.
      await Promise.all([
        oidc.close().catch(() => undefined),
        mail.close().catch(() => undefined),
        payments.close().catch(() => undefined),
        oneRoster.close().catch(() => undefined),
        database.close(),
      ]);
      fs.rmSync(dataDir, { recursive: true, force: true });
    },
  };
}
