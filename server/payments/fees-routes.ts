import express, { Router } from 'express';
import { z } from 'zod';
import {
  feeQuoteQuerySchema,
  feeScheduleSchema,
  manualPaymentInputSchema,
  refundInputSchema,
  type FeeRow,
} from '@shared/api/fee';
import { actorOf, requires } from '../core/policy';
import { nothing, parseId, parseInput } from '../core/validate';
import { recordAudit } from '../core/audit';
import type { Services } from '../services';
import { toCsv } from '../reports/report-csv';
import { reportWorkbook } from '../reports/report-attachments';
import { stateConflict } from '../instruments/instruments-service';
import { findLoanRow } from '../loans/loans-queries';
import { allFeeRows, feeDetail, feeRowOf, listFees, summariseFees } from './fees-queries';
import { quoteLoanFee, readFeeSchedule, writeFeeSchedule } from './fee-schedule';
import { payTokens, reconcile, recordManualPayment } from './payments-service';
import { handleWebhook } from './payments-webhook';
import { refundFee } from './payments-refunds';
import { queueFeeReminder } from './fee-mail';
import { payLinkOf } from './pay-pages';

const summarySchema = z.object({ by: z.enum(['student', 'school', 'year']).default('school') });

function exportRows(rows: FeeRow[], withReasons: boolean): (string | number)[][] {
  const money = (cents: number) => (cents / 100).toFixed(2);
  return [
    [
      'Loan',
      'School year',
      'School',
      'Student',
      'Asset tag',
      'Instrument',
      'Lent on',
      'Fee',
      'Paid',
      'Refunded',
      'Owed',
      'Status',
      ...(withReasons ? ['Waiver reason'] : []),
    ],
    ...rows.map((row) => [
      row.loanId,
      row.schoolYear ?? '',
      row.schoolCode,
      row.studentName,
      row.assetTag,
      row.instrumentName,
      row.checkedOutOn,
      money(row.waived ? 0 : row.feeCents),
      money(row.paidCents),
      money(row.refundedCents),
      money(row.owedCents),
      row.status,
      ...(withReasons ? [row.waiverReason ?? ''] : []),
    ]),
  ];
}

/**
 * `/api/fees`: the usage-fee ledger. Staff who read loans see paid and owed for their schools
 * (waiver reasons only for coordinator and directors); the coordinator edits the schedule,
 * refunds and records payments taken by hand.
 */
export function feesRoutes({ db, config }: Services): Router {
  const router = Router();
  const online = () => config.payments !== undefined;
  router.get('/fees/schedule', requires('loans:read'), async (request, response) => {
    parseInput(nothing, request.query, 'The query');
    response.json(await readFeeSchedule(db, online()));
  });
  router.put('/fees/schedule', requires('fees:manage'), async (request, response) => {
    const input = parseInput(feeScheduleSchema, request.body, 'The fee schedule');
    response.json(await writeFeeSchedule(db, actorOf(request), input, online()));
  });
  router.get('/fees', requires('loans:read'), async (request, response) => {
    response.json(await listFees(db, actorOf(request), request.query));
  });
  router.get('/fees/summary', requires('loans:read'), async (request, response) => {
    const { by } = parseInput(summarySchema, { by: request.query['by'] }, 'The summary');
    const { by: _by, ...rest } = request.query;
    response.json(await summariseFees(db, actorOf(request), by, rest));
  });
  router.get('/fees/reconciliation', requires('fees:manage'), async (request, response) => {
    parseInput(nothing, request.query, 'The query');
    response.json(await reconcile(db, config));
  });
  router.get('/fees/export.csv', requires('loans:read'), async (request, response) => {
    const actor = actorOf(request);
    const rows = await allFeeRows(db, actor, request.query);
    response
      .type('text/csv; charset=utf-8')
      .set('Content-Disposition', 'attachment; filename="usage-fees.csv"')
      .send(toCsv(exportRows(rows, actor.role === 'coordinator' || actor.role === 'director')));
  });
  router.get('/fees/export.xlsx', requires('loans:read'), async (request, response) => {
    const actor = actorOf(request);
    const rows = await allFeeRows(db, actor, request.query);
    const workbook = await reportWorkbook([
      {
        name: 'Usage fees',
        rows: exportRows(rows, actor.role === 'coordinator' || actor.role === 'director'),
      },
    ]);
    response
      .type('application/vnd.openxmlformats-officedocument.spreadsheetml.sheet')
      .set('Content-Disposition', 'attachment; filename="usage-fees.xlsx"')
      .send(workbook);
  });
  router.get('/fees/quote', requires('loans:write'), async (request, response) => {
    const query = parseInput(feeQuoteQuerySchema, request.query, 'The fee quote');
    response.json(await quoteLoanFee(db, actorOf(request), query));
  });
  router.get('/fees/:loanId', requires('loans:see-waivers'), async (request, response) => {
    parseInput(nothing, request.query, 'The query');
    response.json(await feeDetail(db, actorOf(request), parseId(request.params['loanId'])));
  });
  router.post('/fees/:loanId/refunds', requires('fees:manage'), async (request, response) => {
    const input = parseInput(refundInputSchema, request.body, 'The refund');
    response.json(
      await refundFee(db, config, actorOf(request), parseId(request.params['loanId']), input),
    );
  });
  router.post('/fees/:loanId/payments', requires('fees:manage'), async (request, response) => {
    const input = parseInput(manualPaymentInputSchema, request.body, 'The payment');
    response
      .status(201)
      .json(
        await recordManualPayment(db, actorOf(request), parseId(request.params['loanId']), input),
      );
  });
  router.post('/fees/:loanId/reminder', requires('loans:write'), async (request, response) => {
    const actor = actorOf(request);
    const loanId = parseId(request.params['loanId']);
    parseInput(nothing, request.body ?? {}, 'The request');
    const fee = await feeRowOf(db, loanId, actor);
    if (fee.owedCents <= 0)
      throw stateConflict(`This loan’s fee is ${fee.status}; there is nothing to remind about.`);
    const token = (await payTokens(db, config))(loanId);
    const queued = await db.transaction(async (tx) => {
      const row = await findLoanRow(tx, null, loanId);
      const sent = await queueFeeReminder(
        tx,
        row,
        fee.owedCents,
        online() ? payLinkOf(config.appUrl, token) : undefined,
        actor.userId,
      );
      if (sent)
        await recordAudit(tx, actor, { action: 'fee-reminder', entity: 'loan', entityId: loanId });
      return sent;
    });
    response.json({ queued: queued ? 1 : 0 });
  });
  return router;
}

/**
 * `POST /api/payments/webhook`: the service's signed events. Mounted before the JSON parser and
 * the session so the SDK checks the signature over the exact bytes received.
 */
export function paymentsWebhook({ db, config, logger }: Services): Router {
  const router = Router();
  router.post(
    '/api/payments/webhook',
    express.raw({ type: () => true, limit: '1mb' }),
    async (request, response) => {
      const body = Buffer.isBuffer(request.body) ? request.body : Buffer.alloc(0);
      const outcome = await handleWebhook(
        db,
        config,
        logger,
        body,
        request.get('stripe-signature'),
      );
      response.set('Cache-Control', 'no-store').json({ received: true, ...outcome });
    },
  );
  return router;
}
