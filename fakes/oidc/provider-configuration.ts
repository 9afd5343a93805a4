import { randomBytes } from 'node:crypto';
import type { Configuration } from 'oidc-provider';
import { findAccountByEmail, type FakeAccount } from './demo-accounts.js';
import {
  renderLogoutConfirmation,
  renderProviderError,
  renderSignedOut,
} from './provider-pages.js';
import type { SigningKey } from './signing-key.js';

/** A confidential client registered with the fake. */
export interface FakeClient {
  clientId: string;
  clientSecret: string;
}

/** What the fake's provider configuration is built from. */
export interface ProviderSetup {
  accounts: readonly FakeAccount[];
  clients: readonly FakeClient[];
  signingKey: SigningKey;
}

/** Registered only because a client needs one; any loopback callback is allowed instead. */
const placeholderRedirectUri = 'http://127.0.0.1/auth/callback';

const hour = 60 * 60;
const day = 24 * hour;

/**
 * The oidc-provider configuration of the fake: authorization code flow with PKCE (RFC 7636)
 * required, the `openid email profile` scopes (OpenID Connect Core 1.0 §5.4) and our own pages.
 */
export function buildProviderConfiguration(setup: ProviderSetup): Configuration {
  return {
    clients: setup.clients.map((client) => ({
      client_id: client.clientId,
      client_secret: client.clientSecret,
      redirect_uris: [placeholderRedirectUri],
      post_logout_redirect_uris: ['http://127.0.0.1/'],
      response_types: ['code'],
      grant_types: ['authorization_code'],
      // oidc-provider 9 accepts client_secret_post from a client registered for _basic.
      token_endpoint_auth_method: 'client_secret_basic',
    })),
    clientAuthMethods: ['client_secret_basic', 'client_secret_post'],
    responseTypes: ['code'],
    scopes: ['openid', 'email', 'profile'],
    claims: {
      openid: ['sub'],
      email: ['email', 'email_verified'],
      profile: ['name'],
    },
    findAccount(_ctx, sub) {
      const account = findAccountByEmail(setup.accounts, sub);
      if (!account) {
        return undefined;
      }
      return {
        accountId: account.email,
        claims: () => ({
          sub: account.email,
          email: account.email,
          email_verified: true,
          name: account.name,
        }),
      };
    },
    pkce: { required: () => true },
    allowOmittingSingleRegisteredRedirectUri: false,
    cookies: { keys: [randomBytes(32).toString('base64url')] },
    jwks: { keys: [setup.signingKey] },
    interactions: { url: (_ctx, interaction) => `/interaction/${interaction.uid}` },
    features: {
      devInteractions: { enabled: false },
      rpInitiatedLogout: {
        enabled: true,
        logoutSource: renderLogoutConfirmation,
        postLogoutSuccessSource: renderSignedOut,
      },
    },
    renderError: (ctx, out) => renderProviderError(ctx, out),
    clientBasedCORS: () => false,
    ttl: {
      AccessToken: hour,
      AuthorizationCode: 10 * 60,
      IdToken: hour,
      Interaction: hour,
      Session: 14 * day,
      Grant: 14 * day,
    },
  };
}
