import { createServer } from 'node:http';
import { listen } from '../listen.js';
import express from 'express';
import { demoAccounts, type FakeAccount } from './demo-accounts.js';
import { createInteractionRoutes } from './interaction-routes.js';
import { allowLoopbackRedirects } from './loopback-redirects.js';
import { buildProviderConfiguration, type FakeClient } from './provider-configuration.js';
import { createQuietProvider } from './quiet-provider.js';
import { loadSigningKey } from './signing-key.js';

/** How to start the local identity provider. */
export interface OidcFakeOptions {
  /** The port on 127.0.0.1; 0 picks a free one. Defaults to 4310. */
  port?: number;
  /** The accounts that can sign in. Defaults to {@link demoAccounts}. */
  accounts?: FakeAccount[];
  /** The registered clients. Defaults to the one `tuttiboard` client. */
  clients?: { clientId: string; clientSecret: string }[];
  /** Where to keep the RSA signing key (a JWK), so restarts keep ID tokens verifiable. */
  keyFile?: string;
  /**
   * Whether an e-mail address typed on the sign-in page that is not listed becomes an account
   * (named from the address), as a district's own provider would know its staff: a district set
   * up with `tutti setup` signs in as its own coordinator. The app still decides who may enter.
   */
  acceptTypedEmails?: boolean;
}

/** A running local identity provider. */
export interface OidcFake {
  /** The issuer identifier, such as `http://127.0.0.1:4310`. */
  issuer: string;
  /** Stops the server and drops its open connections. */
  close(): Promise<void>;
}

/** The client the application is registered as when no clients are given. */
export const defaultClients: FakeClient[] = [
  { clientId: 'tuttiboard', clientSecret: 'tuttiboard-local-secret' },
];

/**
 * Starts an OpenID Connect identity provider on 127.0.0.1 that stands in for the district's
 * hosted one: authorization code flow with PKCE, our own sign-in page, invented accounts.
 */
export async function startOidcFake(options: OidcFakeOptions = {}): Promise<OidcFake> {
  // A copy: accounts added by typing belong to this provider only.
  const accounts = [...(options.accounts ?? demoAccounts)];
  const clients = options.clients ?? defaultClients;
  const signingKey = loadSigningKey(options.keyFile);
  const server = createServer();
  const port = await listen(server, options.port ?? 4310);
  const issuer = `http://127.0.0.1:${port}`;

  const provider = await createQuietProvider(
    issuer,
    buildProviderConfiguration({ accounts, clients, signingKey }),
  );
  allowLoopbackRedirects(provider);

  const app = express();
  app.disable('x-powered-by');
  app.use(createInteractionRoutes(provider, accounts, options.acceptTypedEmails ?? false));
  app.use(provider.callback());
  server.on('request', app);

  return {
    issuer,
    close: () =>
      new Promise<void>((resolve, reject) => {
        server.close((error) => (error ? reject(error) : resolve()));
        server.closeAllConnections();
      }),
  };
}
