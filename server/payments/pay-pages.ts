import { Router, type Request, type RequestHandler, type Response } from 'express';
import type { Services } from '../services';
import type { Config } from '../config';
import type { Logger } from '../logger';
import { escapeHtml } from '@shared/html/escape-html';
import { HttpError } from '../core/errors';
import { page } from '../loans/agreement-pages';
import { districtIdentity } from '../district/district-queries';
import { formatCents } from '../loans/money';
import { feeRowOf } from './fees-queries';
import { loanOfPayToken } from './payments-service';
import { startCheckout } from './payments-checkout';
import { paymentsClient } from './payments-client';
import type { FeeRow } from '@shared/api/fee';

/** The guardian's pay link of a loan. */
export function payLinkOf(appUrl: string, token: string): string {
  return `${appUrl}/pay/${token}`;
}

/** The address links on these pages go back to: APP_URL, or the address the guardian used. */
function baseOf(config: Config, request: Request): string {
  return config.appUrlIsFixed ? config.appUrl : `${request.protocol}://${request.host}`;
}

const settledWords: Record<string, string> = {
  paid: 'This loan’s usage fee has been paid. Thank you: there is nothing more to pay.',
  waived: 'This loan’s usage fee is waived: there is nothing to pay.',
  refunded: 'This loan’s usage fee was refunded by the district: there is nothing to pay.',
  none: 'This loan has no usage fee: there is nothing to pay.',
  mismatch:
    'We received a payment for this loan that the district’s business office needs to check. Please do not pay again; they will contact you.',
};

/** The "Pay the usage fee" block for the agreement page (empty when nothing is owed or payments are off). */
export function payOffer(fee: FeeRow, link: string, online: boolean): string {
  if (!online || fee.owedCents <= 0) return '';
  return `<form method="post" action="${escapeHtml(link)}" class="pay"><p>The usage fee for this loan is <strong>${escapeHtml(formatCents(fee.owedCents))}</strong>. You can pay it online with a card on the payment service’s page; Tuttiboard never sees the card number.</p><button type="submit">Pay the usage fee</button></form>`;
}

function feeSummary(fee: FeeRow): string {
  return `<p><strong>${escapeHtml(fee.studentName)}</strong> · ${escapeHtml(fee.instrumentName)} (asset tag ${escapeHtml(fee.assetTag)})${fee.schoolYear ? ` · school year ${escapeHtml(fee.schoolYear)}` : ''}</p>`;
}

/** What the guardian's pages share: the district's page frame and the loan a pay link names. */
interface PayPageContext {
  db: Services['db'];
  config: Config;
  online: () => boolean;
  /** One of the guardian's pages, under the district's own name. */
  show: (response: Response, status: number, title: string, body: string) => Promise<void>;
  /** The loan of the link's token and its fee, or undefined after answering 404. */
  lookup: (
    request: Request,
    response: Response,
  ) => Promise<{ token: string; loanId: number; fee: FeeRow } | undefined>;
}

function payPageContext({ db, config }: Services): PayPageContext {
  const show = async (response: Response, status: number, title: string, body: string) =>
    page(response, await districtIdentity(db), status, title, body);
  async function lookup(request: Request, response: Response) {
    const token = String(request.params['token'] ?? '');
    const loanId = await loanOfPayToken(db, config, token);
    if (loanId === undefined) {
      await show(
        response,
        404,
        'This link is not valid',
        '<p>This payment link is not one we know. Check that the whole address from the e-mail was copied, or ask the school’s music director.</p>',
      );
      return undefined;
    }
    return { token, loanId, fee: await feeRowOf(db, loanId) };
  }
  return { db, config, online: () => paymentsClient(config) !== undefined, show, lookup };
}

/** `GET /pay/:token`: what the loan owes, and the button to pay it when payments are on. */
function feePage({ online, show, lookup }: PayPageContext): RequestHandler {
  return async (request, response) => {
    const found = await lookup(request, response);
    if (!found) return;
    const { fee, token } = found;
    if (fee.owedCents <= 0)
      return show(
        response,
        200,
        'Instrument usage fee',
        `${feeSummary(fee)}<p>${escapeHtml(settledWords[fee.status] ?? 'There is nothing to pay.')}</p>`,
      );
    const cancelled =
      request.query['cancelled'] === '1'
        ? '<p class="small">The payment was not made. You can try again when you are ready.</p>'
        : '';
    if (!online())
      return show(
        response,
        200,
        'Instrument usage fee',
        `${feeSummary(fee)}<p>The usage fee is <strong>${escapeHtml(formatCents(fee.owedCents))}</strong>. Please pay it to the school’s music director.</p>`,
      );
    await show(
      response,
      200,
      'Instrument usage fee',
      `${feeSummary(fee)}${cancelled}${payOffer(fee, `/pay/${token}`, true)}`,
    );
  };
}

/** `POST /pay/:token`: opens a checkout session on the payment service and sends the guardian there. */
function startPayment(
  { db, config, show, lookup }: PayPageContext,
  logger: Logger,
): RequestHandler {
  return async (request, response) => {
    const found = await lookup(request, response);
    if (!found) return;
    const { fee, token, loanId } = found;
    const base = `${baseOf(config, request)}/pay/${token}`;
    try {
      const outcome = await startCheckout(db, config, loanId, {
        success: `${base}/done?session_id={CHECKOUT_SESSION_ID}`,
        cancel: `${base}?cancelled=1`,
      });
      if (outcome.state === 'redirect')
        return response.set('Referrer-Policy', 'no-referrer').redirect(303, outcome.url);
      if (outcome.state === 'disabled')
        return show(
          response,
          409,
          'Instrument usage fee',
          `${feeSummary(fee)}<p>Online payment is not offered. Please pay the school’s music director.</p>`,
        );
      return show(
        response,
        409,
        'Nothing to pay',
        `${feeSummary(fee)}<p>${escapeHtml(settledWords[outcome.status] ?? 'There is nothing to pay.')}</p>`,
      );
    } catch (error) {
      if (error instanceof HttpError && error.status === 503) {
        logger.warn({ loanId }, 'Payments unavailable: could not open a checkout session');
        return show(
          response,
          503,
          'Payments are unavailable, try later',
          `${feeSummary(fee)}<p class="error">Payments are unavailable, try later. Nothing was charged.</p>`,
        );
      }
      throw error;
    }
  };
}

/** `GET /pay/:token/done`: where the payment service sends the guardian back. */
function paymentDone({ show, lookup }: PayPageContext): RequestHandler {
  return async (request, response) => {
    const found = await lookup(request, response);
    if (!found) return;
    const { fee } = found;
    if (fee.status === 'paid')
      return show(
        response,
        200,
        'Thank you: the usage fee is paid',
        `${feeSummary(fee)}<p>We received ${escapeHtml(formatCents(fee.paidCents - fee.refundedCents))}. A receipt is on its way by e-mail. You may close this page.</p>`,
      );
    await show(
      response,
      200,
      'Thank you: your payment is being confirmed',
      `${feeSummary(fee)}<p>The payment service is confirming your payment. A receipt will arrive by e-mail once it is confirmed; you do not need to pay again.</p><p class="small"><a href="">Check again</a></p>`,
    );
  };
}

/**
 * The guardian's fee pages, outside /api and without sign-in: the pay link shows what this one
 * loan owes and offers "Pay the usage fee"; the service's hosted page sends the guardian back to
 * the result page. A payment counts only when the service's signed event says so.
 */
export function payPages(services: Services): Router {
  const router = Router();
  const context = payPageContext(services);
  router.get('/pay/:token', feePage(context));
  router.post('/pay/:token', startPayment(context, services.logger));
  router.get('/pay/:token/done', paymentDone(context));
  return router;
}
