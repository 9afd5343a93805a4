import express, { type NextFunction, type Request, type Response, type Router } from 'express';
import type { Provider } from 'oidc-provider';
import { escapeHtml } from '@shared/html/escape-html';
import { findAccountByEmail, type FakeAccount } from './demo-accounts.js';
import { pageContentSecurityPolicy, renderPage } from './page-layout.js';
import { renderSignInPage } from './sign-in-page.js';

type Interaction = Awaited<ReturnType<Provider['interactionDetails']>>;

function sendPage(response: Response, status: number, html: string): void {
  response
    .status(status)
    .set('Content-Security-Policy', pageContentSecurityPolicy)
    .set('Cache-Control', 'no-store')
    .type('html')
    .send(html);
}

function signInPage(
  interaction: Interaction,
  accounts: readonly FakeAccount[],
  error?: string,
  typedEmail?: string,
  acceptTypedEmails?: boolean,
): string {
  return renderSignInPage({
    acceptTypedEmails,
    interactionId: interaction.uid,
    clientId: String(interaction.params['client_id'] ?? 'An application'),
    accounts,
    error,
    typedEmail,
  });
}

/** A new account for a typed, well-formed e-mail address, named from its local part. */
function addTypedAccount(accounts: FakeAccount[], typedEmail: string): FakeAccount | undefined {
  const email = typedEmail.trim().toLowerCase();
  if (!/^[^\s@]+@[^\s@]+\.[^\s@]+$/.test(email)) return undefined;
  const name = email
    .split('@')[0]!
    .split(/[._-]+/)
    .filter(Boolean)
    .map((word) => word[0]!.toUpperCase() + word.slice(1))
    .join(' ');
  const account: FakeAccount = { email, name, role: 'Added by typing the address' };
  accounts.push(account);
  return account;
}

/** Grants what the client asked for: every client of this fake is our own application. */
async function grantRequestedAccess(provider: Provider, interaction: Interaction): Promise<string> {
  const accountId = interaction.session?.accountId;
  const clientId = String(interaction.params['client_id']);
  const grant =
    (interaction.grantId ? await provider.Grant.find(interaction.grantId) : undefined) ??
    new provider.Grant({ accountId, clientId });
  const details = interaction.prompt.details as {
    missingOIDCScope?: string[];
    missingOIDCClaims?: string[];
    missingResourceScopes?: Record<string, string[]>;
  };
  if (details.missingOIDCScope) {
    grant.addOIDCScope(details.missingOIDCScope.join(' '));
  }
  if (details.missingOIDCClaims) {
    grant.addOIDCClaims(details.missingOIDCClaims);
  }
  for (const [indicator, scopes] of Object.entries(details.missingResourceScopes ?? {})) {
    grant.addResourceScope(indicator, scopes.join(' '));
  }
  return grant.save();
}

/** A failed sign-in step: a page saying so, with the error's status (400 when it has none). */
function showInteractionError(
  error: Error & { statusCode?: number },
  _request: Request,
  response: Response,
  _next: NextFunction,
): void {
  const status = error.statusCode && error.statusCode < 600 ? error.statusCode : 400;
  sendPage(
    response,
    status,
    renderPage(
      'Sign-in error — local identity provider',
      `<h2>This sign-in cannot go on</h2><p class="error" role="alert">${escapeHtml(error.message)}</p>
<p>Go back to the application and start signing in again.</p>`,
    ),
  );
}

/**
 * The interaction routes of the fake (oidc-provider's `interactions.url`): our own sign-in page,
 * and consent granted without a page.
 */
export function createInteractionRoutes(
  provider: Provider,
  accounts: FakeAccount[],
  acceptTypedEmails = false,
): Router {
  const router = express.Router();
  const form = express.urlencoded({ extended: false, limit: '8kb' });

  router.get('/interaction/:uid', async (request, response) => {
    const interaction = await provider.interactionDetails(request, response);
    if (interaction.prompt.name === 'login') {
      sendPage(
        response,
        200,
        signInPage(interaction, accounts, undefined, undefined, acceptTypedEmails),
      );
      return;
    }
    if (interaction.prompt.name === 'consent') {
      const grantId = await grantRequestedAccess(provider, interaction);
      await provider.interactionFinished(
        request,
        response,
        { consent: { grantId } },
        { mergeWithLastSubmission: true },
      );
      return;
    }
    throw new Error(`The prompt ${interaction.prompt.name} is not supported by this fake`);
  });

  router.post('/interaction/:uid/login', form, async (request, response) => {
    const interaction = await provider.interactionDetails(request, response);
    const typedEmail = typeof request.body?.email === 'string' ? request.body.email : '';
    const account =
      findAccountByEmail(accounts, typedEmail) ??
      (acceptTypedEmails ? addTypedAccount(accounts, typedEmail) : undefined);
    if (interaction.prompt.name !== 'login') {
      throw new Error('This sign-in has already been completed');
    }
    if (!account) {
      const error = typedEmail.trim()
        ? `There is no account with the e-mail address ${typedEmail.trim()} in this identity provider.`
        : 'Type an e-mail address or choose an account.';
      sendPage(
        response,
        400,
        signInPage(interaction, accounts, error, typedEmail, acceptTypedEmails),
      );
      return;
    }
    await provider.interactionFinished(
      request,
      response,
      { login: { accountId: account.email } },
      { mergeWithLastSubmission: false },
    );
  });

  router.post('/interaction/:uid/abort', async (request, response) => {
    await provider.interactionFinished(
      request,
      response,
      { error: 'access_denied', error_description: 'The person cancelled the sign-in.' },
      { mergeWithLastSubmission: false },
    );
  });

  router.use('/interaction', showInteractionError);

  return router;
}
