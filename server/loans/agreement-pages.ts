import express, { Router, type Response } from 'express';
import type { Services } from '../services';
import { escapeHtml } from '@shared/html/escape-html';
import { cautionsFor } from '../instruments/instrument-cautions';
import { openAgreement, signAgreement, type AgreementLookup } from './agreement-signing';
import { studentNameOf } from './loans-queries';
import { districtIdentity, type DistrictIdentity } from '../district/district-queries';
import { htmlBrand } from '../district/district-print';
import { payTokens } from '../payments/payments-service';
import { feeRowOf } from '../payments/fees-queries';
import { payOffer } from '../payments/pay-pages';

const style = `
body{margin:0;font-family:"Public Sans",system-ui,sans-serif;background:#f4f1ec;color:#2b2824}
main{max-width:44rem;margin:2rem auto;background:#fff;border:1px solid #e3ded7;border-radius:12px;padding:2rem 2.25rem}
.brand{display:flex;align-items:center;font-weight:700;letter-spacing:.04em;color:#8a5f10;font-size:.8rem;text-transform:uppercase}
h1{font-size:1.4rem;margin:.3rem 0 1rem;color:#0b4f55}
.terms{white-space:pre-wrap;line-height:1.55;border:1px solid #e3ded7;border-radius:8px;padding:1rem 1.25rem;background:#fbfaf8;max-height:32rem;overflow:auto}
.caution{border-left:4px solid #b7862b;background:#fbf5e8;padding:.6rem .9rem;margin:.75rem 0;border-radius:4px}
label{display:block;font-weight:600;margin:1.25rem 0 .35rem}
input[type=text]{font:inherit;padding:.55rem .7rem;width:100%;max-width:26rem;border:1px solid #b9b2a8;border-radius:6px}
.pay{border-top:1px solid #e3ded7;margin-top:1.5rem;padding-top:.5rem}
.check{display:flex;gap:.5rem;align-items:flex-start;font-weight:400}
button{font:inherit;font-weight:600;background:#0b5f66;color:#fff;border:0;border-radius:999px;padding:.65rem 1.3rem;margin-top:1.25rem;cursor:pointer}
button:focus-visible,input:focus-visible{outline:3px solid #c8962a;outline-offset:2px}
.error{color:#a3261b;font-weight:600}
.small{color:#6b645b;font-size:.85rem}
code{overflow-wrap:anywhere}
`;

export function page(
  response: Response,
  district: DistrictIdentity | undefined,
  status: number,
  title: string,
  body: string,
) {
  response
    .status(status)
    .set('Cache-Control', 'no-store')
    .set('Referrer-Policy', 'no-referrer')
    .type('html')
    .send(
      `<!doctype html><html lang="en"><head><meta charset="utf-8"><meta name="viewport" content="width=device-width, initial-scale=1"><meta name="robots" content="noindex"><title>${escapeHtml(title)} · Tuttiboard</title><style>${style}</style></head><body><main><div class="brand">${htmlBrand(district, 'instrument loans')}</div><h1>${escapeHtml(title)}</h1>${body}</main></body></html>`,
    );
}

function refused(
  response: Response,
  district: DistrictIdentity | undefined,
  lookup: Exclude<AgreementLookup, { state: 'open' }>,
  offer = '',
) {
  if (lookup.state === 'unknown') {
    return page(
      response,
      district,
      404,
      'This link is not valid',
      '<p>This signing link is not one we know. Check that the whole address from the e-mail was copied, or ask the school’s music director to send a new link.</p>',
    );
  }
  const messages = {
    signed: `This agreement was already signed${lookup.row.loan.signedAt ? ` on ${lookup.row.loan.signedAt.toISOString().slice(0, 10)}` : ''}. Each link can be used once. There is nothing more to do.`,
    expired: 'This signing link has expired. Ask the school’s music director to send a new one.',
    ended: 'This loan has already ended, so there is nothing left to sign.',
  };
  return page(
    response,
    district,
    410,
    'This link can no longer be used',
    `<p>${escapeHtml(messages[lookup.state])}</p>${offer}`,
  );
}

function signingForm(
  response: Response,
  district: DistrictIdentity | undefined,
  token: string,
  lookup: AgreementLookup & { state: 'open' },
  notice = '',
  offer = '',
) {
  const cautions = cautionsFor(lookup.row.instrumentType)
    .map((caution) => `<p class="caution">${escapeHtml(caution)}</p>`)
    .join('');
  page(
    response,
    district,
    notice ? 409 : 200,
    `Loan agreement for ${studentNameOf(lookup.row)}`,
    `${notice ? `<p class="error">${escapeHtml(notice)}</p>` : ''}
<p>Please read the agreement below. To sign it, type your full name and press “Sign the agreement”.</p>
<div class="terms">${escapeHtml(lookup.text)}</div>
${cautions}
<form method="post" action="/agreements/${encodeURIComponent(token)}">
<input type="hidden" name="textHash" value="${lookup.textHash}">
<label for="signedName">Your full name (parent or guardian)</label>
<input type="text" id="signedName" name="signedName" required minlength="2" maxlength="120" autocomplete="name">
<label class="check"><input type="checkbox" name="agree" value="yes" required> I have read this agreement and accept it for my child.</label>
<button type="submit">Sign the agreement</button>
<p class="small">The link works once. We keep your typed name, the time you signed and a fingerprint (SHA-256) of the exact text above.</p>
</form>${offer}`,
  );
}

/**
 * The guardian's signing pages, outside /api and without sign-in: the one-time link shows the
 * agreement and a form to sign it by typing a name. Expired or used links answer 410.
 */
export function agreementPages({ db, config }: Services): Router {
  const router = Router();
  /** "Pay the usage fee" for this loan, when online payment is on and something is owed. */
  const offerFor = async (lookup: AgreementLookup) => {
    if (lookup.state === 'unknown' || !config.payments) return '';
    const tokens = await payTokens(db, config);
    const fee = await feeRowOf(db, lookup.row.loan.id);
    return payOffer(fee, `/pay/${tokens(lookup.row.loan.id)}`, true);
  };
  router.get('/agreements/:token', async (request, response) => {
    const token = request.params['token'] ?? '';
    const district = await districtIdentity(db);
    const lookup = await openAgreement(db, token);
    if (lookup.state !== 'open')
      return refused(
        response,
        district,
        lookup,
        lookup.state === 'signed' ? await offerFor(lookup) : '',
      );
    signingForm(response, district, token, lookup, '', await offerFor(lookup));
  });
  router.post(
    '/agreements/:token',
    express.urlencoded({ extended: false, limit: '16kb' }),
    async (request, response) => {
      const token = request.params['token'] ?? '';
      const district = await districtIdentity(db);
      const body = (request.body ?? {}) as Record<string, unknown>;
      const signedName =
        typeof body['signedName'] === 'string'
          ? body['signedName'].trim().replace(/\s+/g, ' ')
          : '';
      const textHash = typeof body['textHash'] === 'string' ? body['textHash'] : '';
      if (signedName.length < 2 || signedName.length > 120 || body['agree'] !== 'yes') {
        const lookup = await openAgreement(db, token);
        if (lookup.state !== 'open') return refused(response, district, lookup);
        return page(
          response,
          district,
          400,
          'Please finish the form',
          '<p class="error">Type your full name and tick the box to say you accept the agreement.</p><p><a href="">Back to the agreement</a></p>',
        );
      }
      const outcome = await signAgreement(db, token, signedName, textHash);
      if (outcome.state === 'text-changed') {
        return signingForm(
          response,
          district,
          token,
          outcome.lookup,
          'The agreement was updated while you were reading it. Please read the text below, then sign again.',
        );
      }
      if (outcome.state !== 'signed' || !('signedAt' in outcome))
        return refused(response, district, outcome);
      page(
        response,
        district,
        200,
        'Thank you: the agreement is signed',
        `<p>Signed by <strong>${escapeHtml(signedName)}</strong> at ${escapeHtml(outcome.signedAt.toISOString())} for ${escapeHtml(studentNameOf(outcome.row))}.</p><p class="small">Fingerprint of the signed text (SHA-256): <code>${outcome.textHash}</code></p><p>The school keeps a copy.</p>${await offerFor(outcome)}`,
      );
    },
  );
  return router;
}
