import { recordId } from '@shared/api/input-rules';
import { fileNamePrefix } from '../reports/report-render';
import { districtIdentity } from '../district/district-queries';
import { Router } from 'express';
import { z } from 'zod';
import { agreementTextInputSchema, checkoutInputSchema, returnInputSchema } from '@shared/api/loan';
import { actorOf, requires, requiresAny } from '../core/policy';
import { nothing, parseId, parseInput } from '../core/validate';
import type { Services } from '../services';
import { findLoan, listLoans } from './loans-queries';
import { checkOut, resendAgreementLink, returnLoan } from './loans-service';
import { remindOne, remindOverdue } from './loan-reminders';
import { readAgreementText, writeAgreementText } from './agreement-text';
import { agreementPdf } from './agreement-pdf';
import { payTokens } from '../payments/payments-service';

const overdueBatchSchema = z.object({ schoolId: recordId().optional() });

/**
 * `/api/loans`: staff see their schools' loans and a student their own; directors and the
 * coordinator check out; they and technicians take returns.
 */
export function loansRoutes({ db, config }: Services): Router {
  const router = Router();
  const readLoans = requiresAny('loans:read', 'self:read');
  router.get('/loans', readLoans, async (request, response) => {
    response.json(await listLoans(db, actorOf(request), request.query));
  });
  router.get('/loans/agreement-text', requires('loans:read'), async (request, response) => {
    parseInput(nothing, request.query, 'The query');
    response.json(await readAgreementText(db));
  });
  router.put('/loans/agreement-text', requires('loans:agreement'), async (request, response) => {
    const { text } = parseInput(agreementTextInputSchema, request.body, 'The agreement text');
    response.json(await writeAgreementText(db, actorOf(request), text));
  });
  router.post('/loans/overdue-reminders', requires('loans:write'), async (request, response) => {
    const { schoolId } = parseInput(overdueBatchSchema, request.body ?? {}, 'The reminder request');
    response.json(await remindOverdue(db, actorOf(request), schoolId));
  });
  router.post('/loans', requires('loans:write'), async (request, response) => {
    const input = parseInput(checkoutInputSchema, request.body, 'The checkout');
    const payToken = config.payments ? await payTokens(db, config) : undefined;
    response.status(201).json(await checkOut(db, config.appUrl, actorOf(request), input, payToken));
  });
  router.get('/loans/:id', readLoans, async (request, response) => {
    response.json(await findLoan(db, actorOf(request), parseId(request.params['id'])));
  });
  router.get('/loans/:id/agreement.pdf', readLoans, async (request, response) => {
    const pdf = await agreementPdf(db, actorOf(request), parseId(request.params['id']));
    response
      .type('application/pdf')
      .set(
        'Content-Disposition',
        `inline; filename="${fileNamePrefix((await districtIdentity(db))?.shortName)}loan-agreement-${request.params['id']}.pdf"`,
      )
      .send(pdf);
  });
  router.post('/loans/:id/return', requires('loans:return'), async (request, response) => {
    const input = parseInput(returnInputSchema, request.body, 'The return');
    response.json(await returnLoan(db, actorOf(request), parseId(request.params['id']), input));
  });
  router.post('/loans/:id/reminder', requires('loans:write'), async (request, response) => {
    parseInput(nothing, request.body ?? {}, 'The request');
    response.json(await remindOne(db, actorOf(request), parseId(request.params['id'])));
  });
  router.post('/loans/:id/agreement-link', requires('loans:write'), async (request, response) => {
    const id = parseId(request.params['id']);
    response.json(await resendAgreementLink(db, config.appUrl, actorOf(request), id));
  });
  return router;
}
