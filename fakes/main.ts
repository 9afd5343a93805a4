/**
 * Starts the local identity provider and the mail catcher on their default ports, for working
 * on the application without the district's hosted services: `npx tsx fakes/main.ts`.
 */
import { startMailFake } from './mail/index.js';
import { demoAccounts, startOidcFake } from './oidc/index.js';

const oidc = await startOidcFake({ acceptTypedEmails: true });
const mail = await startMailFake().catch(async (error: unknown) => {
  await oidc.close();
  throw error;
});

console.log(`Identity provider (OpenID Connect issuer): ${oidc.issuer}`);
console.log(`Mail catcher: SMTP ${mail.smtpUrl}, mailbox ${mail.httpUrl}`);
console.log('Demo accounts (no password):');
for (const account of demoAccounts) {
  console.log(`  ${account.email.padEnd(36)} ${account.name} — ${account.role}`);
}

let stopping = false;
async function stop(signal: NodeJS.Signals): Promise<void> {
  if (stopping) {
    return;
  }
  stopping = true;
  console.log(`${signal}: stopping the fakes`);
  await Promise.allSettled([oidc.close(), mail.close()]);
  process.exit(0);
}

process.on('SIGINT', (signal) => void stop(signal));
process.on('SIGTERM', (signal) => void stop(signal));
