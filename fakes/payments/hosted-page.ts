import { escapeHtml } from '@shared/html/escape-html';
import type { CheckoutSession } from './payment-objects.js';

const style = `
*{box-sizing:border-box}
body{margin:0;font-family:system-ui,-apple-system,"Segoe UI",sans-serif;background:#eef2f6;color:#1d2733}
.wrap{max-width:27rem;margin:2.5rem auto;padding:0 1rem}
.notice{font-size:.78rem;background:#fff4d6;border:1px solid #e6c66b;color:#5c4610;border-radius:6px;padding:.45rem .7rem;margin-bottom:1rem}
.card{background:#fff;border:1px solid #d5dde6;border-radius:14px;padding:1.6rem 1.6rem 1.3rem;box-shadow:0 2px 10px rgba(20,40,70,.06)}
.payee{font-size:.8rem;text-transform:uppercase;letter-spacing:.06em;color:#4f6275}
.amount{font-size:2rem;font-weight:700;margin:.2rem 0 .1rem}
.items{margin:.4rem 0 1.1rem;padding:0;list-style:none;color:#3c4b5c;font-size:.92rem}
label{display:block;font-weight:600;font-size:.9rem;margin:.9rem 0 .3rem}
input{font:inherit;width:100%;padding:.6rem .7rem;border:1px solid #9fb0c2;border-radius:8px}
.row{display:flex;gap:.8rem}.row>div{flex:1}
button{font:inherit;font-weight:700;width:100%;margin-top:1.3rem;padding:.75rem;border:0;border-radius:8px;background:#24507a;color:#fff;cursor:pointer}
button:focus-visible,input:focus-visible,a:focus-visible{outline:3px solid #e0a526;outline-offset:2px}
.error{color:#a32117;font-weight:600;margin:.8rem 0 0}
.small{font-size:.8rem;color:#56687a;margin-top:1rem}
a{color:#24507a}
`;

function shell(title: string, body: string): string {
  return `<!doctype html><html lang="en"><head><meta charset="utf-8"><meta name="viewport" content="width=device-width, initial-scale=1"><meta name="robots" content="noindex"><title>${escapeHtml(title)}</title><style>${style}</style></head><body><div class="wrap"><p class="notice">Local test payment page: no real money moves and card numbers are not kept.</p>${body}</div></body></html>`;
}

/** An amount in minor units as the currency is written, e.g. 4500 usd → "USD 45.00". */
export function formatAmount(minor: number, currency: string): string {
  return `${currency.toUpperCase()} ${(minor / 100).toFixed(2)}`;
}

/** The hosted page where the payer types a card; `error` re-renders it after a decline. */
export function paymentForm(session: CheckoutSession, error = ''): string {
  const items = session.line_items_summary
    .map(
      (item) =>
        `<li>${escapeHtml(item.name)}${item.quantity > 1 ? ` × ${item.quantity}` : ''}</li>`,
    )
    .join('');
  return shell(
    'Pay securely',
    `<div class="card"><div class="payee">Payment</div>
<div class="amount">${escapeHtml(formatAmount(session.amount_total, session.currency))}</div>
<ul class="items">${items}</ul>
<form method="post" action="/pay/${encodeURIComponent(session.id)}" autocomplete="off">
<label for="card">Card number</label>
<input id="card" name="card" inputmode="numeric" placeholder="1234 1234 1234 1234" required maxlength="23">
<div class="row"><div><label for="expiry">Expiry (MM / YY)</label><input id="expiry" name="expiry" placeholder="MM / YY" required maxlength="7"></div>
<div><label for="cvc">Security code</label><input id="cvc" name="cvc" inputmode="numeric" placeholder="123" required maxlength="4"></div></div>
${error ? `<p class="error" role="alert">${escapeHtml(error)}</p>` : ''}
<button type="submit">Pay ${escapeHtml(formatAmount(session.amount_total, session.currency))}</button>
</form>
${session.cancel_url ? `<p class="small"><a href="${escapeHtml(session.cancel_url)}">Cancel and go back</a></p>` : ''}
<p class="small">Test cards: 4242 4242 4242 4242 pays, 4000 0000 0000 0002 is declined; any future expiry and any three digits.</p></div>`,
  );
}

/** A page for a session that can no longer be paid. */
export function closedPage(title: string, message: string, back?: string | null): string {
  return shell(
    title,
    `<div class="card"><h1 style="font-size:1.3rem">${escapeHtml(title)}</h1><p>${escapeHtml(message)}</p>${back ? `<p><a href="${escapeHtml(back)}">Go back</a></p>` : ''}</div>`,
  );
}
