import { escapeHtml } from '@shared/html/escape-html';

/**
 * The Content-Security-Policy of every page the identity provider renders: no scripts, no
 * external requests, styles from the page itself only.
 */
export const pageContentSecurityPolicy =
  "default-src 'none'; style-src 'unsafe-inline'; base-uri 'none'; frame-ancestors 'none'";

const style = `
  :root { color-scheme: light; --ink: #1d2a33; --muted: #52616b; --line: #c9d3d9; --accent: #1f5f7a; --paper: #f4f6f2; --danger: #9b2226; }
  * { box-sizing: border-box; }
  body { margin: 0; background: var(--paper); color: var(--ink); font: 16px/1.5 system-ui, -apple-system, 'Segoe UI', Roboto, sans-serif; }
  header { background: var(--accent); color: #fff; padding: 1rem 1.5rem; }
  header h1 { margin: 0; font-size: 1.25rem; font-weight: 600; }
  header p { margin: .25rem 0 0; opacity: .85; font-size: .9rem; }
  main { max-width: 44rem; margin: 1.5rem auto; padding: 0 1rem; }
  h2 { font-size: 1.05rem; margin: 1.5rem 0 .5rem; }
  .accounts { list-style: none; margin: 0; padding: 0; display: grid; gap: .5rem; }
  .account { width: 100%; text-align: left; display: grid; grid-template-columns: 1fr auto; gap: 0 1rem; padding: .75rem 1rem; border: 1px solid var(--line); border-radius: .5rem; background: #fff; color: inherit; font: inherit; cursor: pointer; }
  .account:hover, .account:focus-visible { border-color: var(--accent); outline: 2px solid var(--accent); outline-offset: 1px; }
  .account .name { font-weight: 600; }
  .account .email { color: var(--muted); font-size: .9rem; grid-column: 1; }
  .account .role { grid-column: 2; grid-row: 1 / span 2; align-self: center; text-align: right; font-size: .9rem; }
  .account .note { display: block; color: var(--muted); font-size: .8rem; }
  form.by-email { display: flex; gap: .5rem; flex-wrap: wrap; align-items: end; }
  label { display: grid; gap: .25rem; flex: 1 1 16rem; font-weight: 600; font-size: .9rem; }
  input[type=email] { font: inherit; padding: .5rem .75rem; border: 1px solid var(--line); border-radius: .375rem; }
  button.primary, button.secondary { font: inherit; padding: .5rem 1rem; border-radius: .375rem; cursor: pointer; border: 1px solid var(--accent); }
  button.primary { background: var(--accent); color: #fff; }
  button.secondary { background: #fff; color: var(--accent); }
  .error { border-left: 4px solid var(--danger); background: #fbeaea; color: var(--danger); padding: .75rem 1rem; border-radius: .25rem; }
  .small { color: var(--muted); font-size: .85rem; }
  dl { display: grid; grid-template-columns: max-content 1fr; gap: .25rem 1rem; }
  dt { font-weight: 600; }
  dd { margin: 0; overflow-wrap: anywhere; }
  .actions { display: flex; gap: .5rem; flex-wrap: wrap; }
`;

/** Wraps page content in the identity provider's own layout: plain HTML and an inline style. */
export function renderPage(title: string, content: string): string {
  return `<!doctype html>
<html lang="en">
<head>
<meta charset="utf-8">
<meta name="viewport" content="width=device-width, initial-scale=1">
<meta name="referrer" content="no-referrer">
<title>${escapeHtml(title)}</title>
<style>${style}</style>
</head>
<body>
<header>
<h1>Sign in — local identity provider for development</h1>
<p>The demo district's invented accounts, for development, demos and tests. No password is asked.</p>
</header>
<main>
${content}
</main>
</body>
</html>
`;
}
