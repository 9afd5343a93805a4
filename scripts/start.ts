import { loadConfig } from '../server/config';
import { createLogger } from '../server/logger';
import { closeOnSignals, startServer } from '../server/main';
import { seedDemoWhenEmpty } from '../server/seed/demo';
import { demoDistrict } from '../server/seed/demo-people';
import { findDistrictRow } from '../server/district/district-queries';
import { demoAccounts, startOidcFake, type OidcFake } from '../fakes/oidc/index';
import { startMailFake, type MailFake } from '../fakes/mail/index';
import { startPaymentsFake, type PaymentsFake } from '../fakes/payments/index';
import { startOneRosterFake, type OneRosterFake } from '../fakes/oneroster/index';
import { localSecretKey } from './local-secret-key';
import { buildWebIfMissing } from './build-if-missing';

/**
 * `npm start`: builds the web app when missing, starts the local identity provider and mail
 * catcher (unless OIDC_ISSUER or SMTP_URL point elsewhere), migrates, seeds the demo district
 * into an empty database, and serves the app. Ctrl-C stops all of it.
 */
async function start() {
  // Online payments go to the local payment-service fake unless PAYMENTS_SECRET_KEY says otherwise.
  const usesLocalPayments = !process.env['PAYMENTS_SECRET_KEY'];
  const payments: PaymentsFake | undefined = usesLocalPayments
    ? await startPaymentsFake({ port: 4312 })
    : undefined;
  if (payments) {
    process.env['PAYMENTS_SECRET_KEY'] = payments.secretKey;
    process.env['PAYMENTS_WEBHOOK_SECRET'] = payments.webhookSecret;
    process.env['PAYMENTS_API_URL'] = payments.url;
  }
  // Secrets kept in the database (the OneRoster sync's client secret) are sealed with
  // TUTTI_SECRET_KEY; a local start without one makes one and keeps it in the data folder.
  process.env['TUTTI_SECRET_KEY'] ??= localSecretKey(process.env['TUTTI_DATA_DIR'] ?? './data');
  const config = loadConfig();
  const logger = createLogger(config.logLevel);
  buildWebIfMissing();

  const usesLocalIdentity = !process.env['OIDC_ISSUER'];
  const usesLocalMail = !process.env['SMTP_URL'];
  const oidc: OidcFake | undefined = usesLocalIdentity
    ? await startOidcFake({ port: 4310, acceptTypedEmails: true })
    : undefined;
  const mail: MailFake | undefined = usesLocalMail
    ? await startMailFake({
        smtpPort: 2525,
        httpPort: 4311,
        storeFile: `${config.dataDir}/mailbox.jsonl`,
      })
    : undefined;

  // A OneRoster REST provider serving a small roster of the demo district, for the sync.
  const oneRoster: OneRosterFake = await startOneRosterFake({
    port: 4313,
    clientId: 'tutti-sync',
    clientSecret: 'local-oneroster-secret',
  });

  let seeded = false;
  let isDemo = false;
  const server = await startServer(config, {
    logger,
    prepare: async ({ db }) => {
      seeded = await seedDemoWhenEmpty(db);
      isDemo = (await findDistrictRow(db))?.name === demoDistrict.name;
    },
  });

  payments?.setWebhookUrl(`${server.url}/api/payments/webhook`);

  const lines = [
    '',
    '  Tuttiboard is running.',
    '',
    `  App                 ${server.url}`,
    oidc ? `  Sign-in (local)     ${oidc.issuer}` : `  Sign-in             ${config.oidcIssuer}`,
    mail ? `  Mailbox (local)     ${mail.httpUrl}` : `  Mail relay          ${config.smtpUrl}`,
    payments
      ? `  Payments (local)    ${payments.url} (test card 4242 4242 4242 4242)`
      : `  Payments            ${config.payments ? 'hosted service' : 'off (fees by hand)'}`,
    `  OneRoster (local)   ${oneRoster.url} (token ${oneRoster.tokenUrl}, client ${oneRoster.clientId} / ${oneRoster.clientSecret})`,
    `  Database            ${config.databaseUrl ? 'PostgreSQL server (DATABASE_URL)' : `PGlite in ${config.dataDir}`}`,
    seeded ? `  Seeded the demo district, ${demoDistrict.name}.` : '',
    '',
    oidc && isDemo ? '  Demo accounts (choose one on the sign-in page):' : '',
    oidc && !isDemo ? '  Sign in by typing your e-mail address on the local sign-in page.' : '',
    ...(oidc && isDemo
      ? demoAccounts.map((account) => `    ${account.email.padEnd(38)} ${account.role}`)
      : []),
    '',
    '  Press Ctrl-C to stop.',
    '',
  ];
  process.stdout.write(
    lines.filter((line, index, all) => line !== '' || all[index - 1] !== '').join('\n') + '\n',
  );

  closeOnSignals(async () => {
    await server.close();
    await Promise.all([oidc?.close(), mail?.close(), payments?.close(), oneRoster.close()]);
  }, logger);
}

start().catch((error: unknown) => {
  process.stderr.write(
    `Tuttiboard could not start: ${error instanceof Error ? error.message : String(error)}\n`,
  );
  process.exit(1);
});
