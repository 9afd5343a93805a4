import { escapeHtml } from '@shared/html/escape-html';
import type { FakeAccount } from './demo-accounts.js';
import { renderPage } from './page-layout.js';

/** What the sign-in page shows for one interaction. */
export interface SignInPageContent {
  /** The interaction's id, which the forms post back to. */
  interactionId: string;
  /** The client asking for the sign-in. */
  clientId: string;
  accounts: readonly FakeAccount[];
  /** An error to show above the forms, such as an unknown e-mail address. */
  error?: string;
  /** The e-mail address typed before, kept in the field after an error. */
  typedEmail?: string;
  /** Whether a typed address that is not listed becomes an account. */
  acceptTypedEmails?: boolean;
}

function renderAccount(account: FakeAccount): string {
  const note = account.note ? `<span class="note">${escapeHtml(account.note)}</span>` : '';
  return `<li><button class="account" type="submit" name="email" value="${escapeHtml(account.email)}">
<span class="name">${escapeHtml(account.name)}</span>
<span class="email">${escapeHtml(account.email)}</span>
<span class="role">${escapeHtml(account.role)}${note}</span>
</button></li>`;
}

/** Renders the sign-in page: the accounts as buttons, and a field for any account's e-mail. */
export function renderSignInPage(content: SignInPageContent): string {
  const action = `/interaction/${encodeURIComponent(content.interactionId)}`;
  const error = content.error
    ? `<p class="error" role="alert" id="sign-in-error">${escapeHtml(content.error)}</p>`
    : '';
  return renderPage(
    'Sign in — Merrow Basin Unified (local identity provider)',
    `${error}
<p><strong>${escapeHtml(content.clientId)}</strong> asks you to sign in. Choose an account.</p>
<form method="post" action="${action}/login" id="account-form">
<ul class="accounts">
${content.accounts.map(renderAccount).join('\n')}
</ul>
</form>
<h2>Or type the account's e-mail address</h2>
<form method="post" action="${action}/login" id="sign-in-form" class="by-email">
<label>E-mail address
<input type="email" name="email" required autocomplete="username" value="${escapeHtml(content.typedEmail ?? '')}">
</label>
<button class="primary" type="submit">Sign in</button>
</form>
<h2>Changed your mind?</h2>
<form method="post" action="${action}/abort">
<button class="secondary" type="submit">Cancel sign-in</button>
</form>
<p class="small">${
      content.acceptTypedEmails
        ? 'Any other e-mail address typed above becomes an account of this provider; Tuttiboard still lets in only the people it knows.'
        : 'Only the accounts listed above exist in this identity provider.'
    }</p>`,
  );
}
