import { escapeHtml } from '@shared/html/escape-html';

/**
 * A small server-rendered page for the moments the app itself cannot load: sign-in failures
 * and the identity provider being down. It uses the app's own stylesheet-free look.
 */
export function plainPage(options: {
  title: string;
  message: string;
  action?: { href: string; label: string };
  /** The district's name above the title, when it is set up. */
  brand?: string;
  /** Trusted markup after the message (already escaped by the caller). */
  detailHtml?: string;
}) {
  const action = options.action
    ? `<p><a class="button" href="${escapeHtml(options.action.href)}">${escapeHtml(options.action.label)}</a></p>`
    : '';
  return `<!doctype html>
<html lang="en"><head><meta charset="utf-8"><meta name="viewport" content="width=device-width, initial-scale=1">
<title>${escapeHtml(options.title)} · Tuttiboard</title>
<style>
body{margin:0;font-family:"Public Sans",system-ui,sans-serif;background:#f6f4f1;color:#2b2824;display:grid;place-items:center;min-height:100vh}
main{max-width:34rem;background:#fff;border:1px solid #e3ded7;border-radius:12px;padding:2rem 2.25rem;box-shadow:0 1px 3px rgba(0,0,0,.06)}
h1{font-size:1.35rem;margin:0 0 .75rem;color:#0b4f55}
p{line-height:1.55}
.brand{font-weight:700;letter-spacing:.02em;color:#9a6b12;font-size:.85rem;text-transform:uppercase}
a.button{display:inline-block;background:#0b5f66;color:#fff;padding:.6rem 1.1rem;border-radius:999px;text-decoration:none;font-weight:600}
a.button:focus-visible{outline:3px solid #c8962a;outline-offset:2px}
pre{background:#f6f4f1;border:1px solid #e3ded7;border-radius:8px;padding:.75rem 1rem;white-space:pre-wrap;word-break:break-word;font-size:.9rem}
</style></head>
<body><main><div class="brand">${escapeHtml(options.brand ?? 'Tuttiboard')}</div><h1>${escapeHtml(options.title)}</h1><p>${escapeHtml(options.message)}</p>${options.detailHtml ?? ''}${action}</main></body></html>`;
}
