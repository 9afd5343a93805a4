import express, { type Express } from 'express';
import { closedPage, paymentForm } from './hosted-page.js';
import type { PaymentLedger } from './payment-ledger.js';

// The service's published test card number that is always declined (its generic decline card).
const declinedCard = '4000000000000002';

/** The Luhn check digit test (ISO/IEC 7812-1 Annex B). */
export function passesLuhn(digits: string): boolean {
  let sum = 0;
  for (let index = 0; index < digits.length; index += 1) {
    let digit = Number(digits[digits.length - 1 - index]);
    if (index % 2 === 1) {
      digit *= 2;
      if (digit > 9) digit -= 9;
    }
    sum += digit;
  }
  return digits.length >= 12 && sum % 10 === 0;
}

/** What is wrong with the card the form sent (its number, expiry and security code), if anything. */
function cardProblem(card: string, body: Record<string, string>): string | undefined {
  if (!/^\d{12,19}$/.test(card) || !passesLuhn(card)) return 'Your card number is incorrect.';
  if (!/^\s*(0[1-9]|1[0-2])\s*\/?\s*\d{2}\s*$/.test(String(body['expiry'] ?? '')))
    return 'Your card’s expiry date is incomplete.';
  if (!/^\d{3,4}$/.test(String(body['cvc'] ?? '').trim()))
    return 'Your card’s security code is incomplete.';
  return undefined;
}

/** The hosted payment page: the form for an open session, and its answer when sent. */
export function hostedPageRoutes(app: Express, ledger: PaymentLedger): void {
  app.get('/pay/:id', (request, response): void => {
    const session = ledger.sessions.get(request.params['id'] ?? '');
    response.set('Cache-Control', 'no-store').type('html');
    if (!session) {
      response
        .status(404)
        .send(closedPage('Payment page not found', 'This payment link is not valid.'));
      return;
    }
    ledger.expireIfDue(session);
    if (session.status === 'complete')
      return void response.send(
        closedPage(
          'Already paid',
          'This payment has been made. Thank you.',
          session.success_url?.replaceAll('{CHECKOUT_SESSION_ID}', session.id),
        ),
      );
    if (session.status === 'expired')
      return void response
        .status(410)
        .send(
          closedPage(
            'This payment page has expired',
            'Go back to the site you came from to start again.',
            session.cancel_url,
          ),
        );
    response.send(paymentForm(session));
  });
  app.post(
    '/pay/:id',
    express.urlencoded({ extended: false, limit: '4kb' }),
    (request, response): void => {
      const session = ledger.sessions.get(request.params['id'] ?? '');
      response.set('Cache-Control', 'no-store').type('html');
      if (!session)
        return void response
          .status(404)
          .send(closedPage('Payment page not found', 'This payment link is not valid.'));
      const body = (request.body ?? {}) as Record<string, string>;
      const card = String(body['card'] ?? '').replace(/[\s-]/g, '');
      const problem = cardProblem(card, body);
      if (problem) return void response.status(400).send(paymentForm(session, problem));
      const outcome = ledger.pay(session, card);
      if (outcome === 'closed')
        return void response
          .status(410)
          .send(
            closedPage(
              'This payment page can no longer be used',
              session.status === 'complete'
                ? 'This payment has already been made.'
                : 'It has expired. Go back to start again.',
              session.cancel_url,
            ),
          );
      if (outcome === 'declined')
        return void response
          .status(402)
          .send(
            paymentForm(
              session,
              card === declinedCard
                ? 'Your card was declined.'
                : 'Your card was declined. Use one of the test cards below.',
            ),
          );
      response.redirect(303, session.success_url!.replaceAll('{CHECKOUT_SESSION_ID}', session.id));
    },
  );
}
