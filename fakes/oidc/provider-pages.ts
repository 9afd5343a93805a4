import type { KoaContextWithOIDC } from 'oidc-provider';
import { escapeHtml } from '@shared/html/escape-html';
import { pageContentSecurityPolicy, renderPage } from './page-layout.js';

function respondWithPage(ctx: KoaContextWithOIDC, title: string, content: string): void {
  ctx.type = 'html';
  ctx.set('Content-Security-Policy', pageContentSecurityPolicy);
  ctx.body = renderPage(title, content);
}

/**
 * The confirmation page of RP-initiated logout (OpenID Connect RP-Initiated Logout 1.0 §2):
 * `form` is the provider's own form with its anti-forgery token; the buttons submit it.
 */
export function renderLogoutConfirmation(ctx: KoaContextWithOIDC, form: string): void {
  respondWithPage(
    ctx,
    'Sign out — Merrow Basin Unified (local identity provider)',
    `<h2>Sign out of the local identity provider?</h2>
${form}
<div class="actions">
<button class="primary" type="submit" form="op.logoutForm" name="logout" value="yes">Yes, sign me out</button>
<button class="secondary" type="submit" form="op.logoutForm">No, stay signed in</button>
</div>`,
  );
}

/** The page shown after a logout that named no post-logout redirect URI. */
export function renderSignedOut(ctx: KoaContextWithOIDC): void {
  respondWithPage(
    ctx,
    'Signed out — Merrow Basin Unified (local identity provider)',
    '<h2>You are signed out</h2><p>You can close this page.</p>',
  );
}

/** The provider's error page, for errors it cannot send back to a client's redirect URI. */
export function renderProviderError(
  ctx: KoaContextWithOIDC,
  out: { error: string; error_description?: string },
): void {
  const description = out.error_description
    ? `<dt>Description</dt><dd>${escapeHtml(out.error_description)}</dd>`
    : '';
  respondWithPage(
    ctx,
    'Sign-in error — Merrow Basin Unified (local identity provider)',
    `<h2>The sign-in request was refused</h2>
<dl><dt>Error</dt><dd id="error-code">${escapeHtml(out.error)}</dd>${description}</dl>`,
  );
}
