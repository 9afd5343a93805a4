import { escapeHtml } from '@shared/html/escape-html';
import type { CaughtMessage } from './caught-message.js';

/** The views of one message the message page has tabs for. */
export type MessageView = 'html' | 'text' | 'attachments';

const style = `
  * { box-sizing: border-box; }
  body { margin: 0; font: 15px/1.45 system-ui, -apple-system, 'Segoe UI', Roboto, sans-serif; color: #222b30; background: #fbfaf7; }
  header { display: flex; gap: 1rem; align-items: baseline; flex-wrap: wrap; padding: .75rem 1.25rem; background: #33403f; color: #fff; }
  header h1 { margin: 0; font-size: 1.1rem; }
  header a { color: #fff; }
  header .address { font-family: ui-monospace, monospace; font-size: .85rem; opacity: .8; }
  main { padding: 1rem 1.25rem; }
  table { width: 100%; border-collapse: collapse; background: #fff; }
  th, td { text-align: left; padding: .5rem .75rem; border-bottom: 1px solid #e1ddd3; vertical-align: top; }
  th { font-size: .8rem; text-transform: uppercase; letter-spacing: .04em; color: #5b6561; }
  td.time { white-space: nowrap; font-variant-numeric: tabular-nums; color: #5b6561; }
  a { color: #1d5c63; }
  .empty { color: #5b6561; }
  .toolbar { display: flex; gap: .75rem; align-items: center; margin-bottom: 1rem; }
  button { font: inherit; padding: .35rem .9rem; border: 1px solid #8c2f39; background: #fff; color: #8c2f39; border-radius: .3rem; cursor: pointer; }
  dl { display: grid; grid-template-columns: max-content 1fr; gap: .2rem 1rem; margin: 0 0 1rem; }
  dt { font-weight: 600; color: #5b6561; }
  dd { margin: 0; overflow-wrap: anywhere; }
  nav.tabs { display: flex; gap: .25rem; border-bottom: 2px solid #33403f; }
  nav.tabs a, nav.tabs span { padding: .4rem .9rem; border: 1px solid #c9c4b8; border-bottom: 0; border-radius: .3rem .3rem 0 0; text-decoration: none; background: #fff; }
  nav.tabs a[aria-current=page] { background: #33403f; color: #fff; border-color: #33403f; }
  nav.tabs span { color: #9aa19d; }
  iframe { width: 100%; height: 70vh; border: 1px solid #c9c4b8; border-top: 0; background: #fff; }
  pre { margin: 0; padding: 1rem; background: #fff; border: 1px solid #c9c4b8; border-top: 0; white-space: pre-wrap; overflow-wrap: anywhere; }
  ul.inline { margin: 0; padding-left: 1.1rem; }
  ul.files { margin: 0; padding: 1rem 1rem 1rem 2rem; background: #fff; border: 1px solid #c9c4b8; border-top: 0; }
`;

function renderLayout(title: string, smtpUrl: string, content: string): string {
  return `<!doctype html>
<html lang="en">
<head>
<meta charset="utf-8">
<meta name="viewport" content="width=device-width, initial-scale=1">
<title>${escapeHtml(title)}</title>
<style>${style}</style>
</head>
<body>
<header><h1><a href="/">Merrow Basin Unified — local mailbox</a></h1>
<span class="address">Catching mail at ${escapeHtml(smtpUrl)}</span></header>
<main>
${content}
</main>
</body>
</html>
`;
}

function renderTime(receivedAt: string): string {
  const shown = receivedAt.replace('T', ' ').replace(/\.\d+Z$/, ' UTC');
  return `<time datetime="${escapeHtml(receivedAt)}">${escapeHtml(shown)}</time>`;
}

function formatBytes(size: number): string {
  if (size < 1024) {
    return `${size} B`;
  }
  return size < 1024 * 1024
    ? `${(size / 1024).toFixed(1)} KB`
    : `${(size / 1024 / 1024).toFixed(1)} MB`;
}

/** The mailbox page: every caught message, newest first. */
export function renderMailboxPage(messages: readonly CaughtMessage[], smtpUrl: string): string {
  const rows = messages
    .map(
      (message) => `<tr>
<td class="time">${renderTime(message.receivedAt)}</td>
<td>${escapeHtml(message.from)}</td>
<td>${escapeHtml(message.to.join(', '))}</td>
<td><a href="/messages/${message.id}">${escapeHtml(message.subject || '(no subject)')}</a>${
        message.attachments.length ? ` <small>(${message.attachments.length} attached)</small>` : ''
      }</td>
</tr>`,
    )
    .join('\n');
  const list = messages.length
    ? `<table><thead><tr><th>Received</th><th>From</th><th>To</th><th>Subject</th></tr></thead>
<tbody>
${rows}
</tbody></table>`
    : '<p class="empty">No messages yet. Anything sent to the SMTP address above shows up here.</p>';
  return renderLayout(
    `Mailbox (${messages.length}) — Merrow Basin Unified`,
    smtpUrl,
    `<div class="toolbar"><a href="/">Refresh</a>
<form method="post" action="/clear"><button type="submit">Delete all messages</button></form></div>
${list}`,
  );
}

function renderTabs(message: CaughtMessage, view: MessageView): string {
  const tabs: { view: MessageView; label: string; available: boolean }[] = [
    { view: 'html', label: 'HTML', available: message.html !== null },
    { view: 'text', label: 'Text', available: true },
    {
      view: 'attachments',
      label: `Attachments (${message.attachments.length})`,
      available: message.attachments.length > 0,
    },
  ];
  return `<nav class="tabs" aria-label="Views of the message">${tabs
    .map((tab) =>
      tab.available
        ? `<a href="/messages/${message.id}?view=${tab.view}"${
            tab.view === view ? ' aria-current="page"' : ''
          }>${escapeHtml(tab.label)}</a>`
        : `<span>${escapeHtml(tab.label)}</span>`,
    )
    .join('')}</nav>`;
}

function renderAttachmentLinks(message: CaughtMessage): string {
  return message.attachments
    .map(
      (attachment, index) =>
        `<li><a href="/api/messages/${message.id}/attachments/${index}">${escapeHtml(
          attachment.filename,
        )}</a> — ${escapeHtml(attachment.contentType)}, ${formatBytes(attachment.size)}</li>`,
    )
    .join('');
}

function renderView(message: CaughtMessage, view: MessageView): string {
  if (view === 'html' && message.html !== null) {
    return `<iframe sandbox src="/messages/${message.id}/html" title="HTML part of the message" referrerpolicy="no-referrer"></iframe>`;
  }
  if (view === 'attachments') {
    return `<ul class="files">${renderAttachmentLinks(message)}</ul>`;
  }
  return `<pre>${escapeHtml(message.text)}</pre>`;
}

/** One message: its headers, and tabs for the HTML part, the text part and the attachments. */
export function renderMessagePage(
  message: CaughtMessage,
  view: MessageView,
  smtpUrl: string,
): string {
  const cc = message.cc.length ? `<dt>Cc</dt><dd>${escapeHtml(message.cc.join(', '))}</dd>` : '';
  const attachments = message.attachments.length
    ? `<dt>Attachments</dt><dd><ul class="inline">${renderAttachmentLinks(message)}</ul></dd>`
    : '';
  return renderLayout(
    `${message.subject || '(no subject)'} — Merrow Basin Unified mailbox`,
    smtpUrl,
    `<p><a href="/">← All messages</a></p>
<h2>${escapeHtml(message.subject || '(no subject)')}</h2>
<dl>
<dt>From</dt><dd>${escapeHtml(message.from)}</dd>
<dt>To</dt><dd>${escapeHtml(message.to.join(', '))}</dd>
${cc}
<dt>Received</dt><dd>${renderTime(message.receivedAt)}</dd>
<dt>Message-ID</dt><dd>${escapeHtml(message.messageId ?? '—')}</dd>
${attachments}
</dl>
${renderTabs(message, view)}
${renderView(message, view)}`,
  );
}

/** A page for an address the mailbox does not have. */
export function renderNotFoundPage(smtpUrl: string): string {
  return renderLayout(
    'Not found — Merrow Basin Unified mailbox',
    smtpUrl,
    '<p>No such page or message.</p><p><a href="/">All messages</a></p>',
  );
}
