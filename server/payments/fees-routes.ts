import express, { Router, type RequestHandler } from 'express';
import { z } from 'zod';
import {
  feeQuoteQuerySchema,
  feeScheduleSchema,
  manualPaymentInputSchema,
  refundInputSchema,
  type FeeRow,
} from '@shared/api/fee';
import { actorOf, requires, type Actor } from '../core/policy';
import { answer, created, idOf, type RouteWork } from '../core/routes';
import { nothing, parseInput } from '../core/validate';
import type { Database } from '../db/client';
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

/** Waiver reasons go into an export only for the coordinator and directors. */
const seesReasons = (actor: Actor) => actor.role === 'coordinator' || actor.role === 'director';

/** `GET /fees/export.csv` and `.xlsx`: every fee row the query selects, as a file. */
function exportRoute(db: Database, format: 'csv' | 'xlsx'): RequestHandler {
  return async (request, response) => {
    const actor = actorOf(request);
    const rows = exportRows(await allFeeRows(db, actor, request.query), seesReasons(actor));
    if (format === 'csv') {
      response
        .type('text/csv; charset=utf-8')
        .set('Content-Disposition', 'attachment; filename="usage-fees.csv"')
        .send(toCsv(rows));
      return;
    }
    const workbook = await reportWorkbook([{ name: 'Usage fees', rows }]);
    response
      .type('application/vnd.openxmlformats-officedocument.spreadsheetml.sheet')
      .set('Content-Disposition', 'attachment; filename="usage-fees.xlsx"')
      .send(workbook);
  };
}

/** `POST /fees/:loanId/reminder`: e-mails the guardian what the loan owes (with the pay link when payments are on). */
function reminderRoute({ db, config }: Services): RouteWork {
  return async (request, actor) => {
    const loanId = idOf(request, 'loanId');
    parseInput(nothing, request.body ?? {}, 'The request');
    const fee = await feeRowOf(db, loanId, actor);
    if (fee.owedCents <= 0)
      throw stateConflict(`This loan’s fee is ${fee.status}; there is nothing to remind about.`);
    const token = (await payTokens(db, config))(loanId);
    const link = config.payments !== undefined ? payLinkOf(config.appUrl, token) : undefined;
    const queued = await db.transaction(async (tx) => {
      const row = await findLoanRow(tx, null, loanId);
      const sent = await queueFeeReminder(tx, row, fee.owedCents, link, actor.userId);
      if (sent)
        await recordAudit(tx, actor, { action: 'fee-reminder', entity: 'loan', entityId: loanId });
      return sent;
    });
    return { queued: queued ? 1 : 0 };
  };
}

/** A route that takes no query parameters and answers what `work` reads. */
const withoutQuery = (work: RouteWork): RequestHandler =>
  answer(async (request, actor) => {
    parseInput(nothing, request.query, 'The query');
    return work(request, actor);
  });

/**
 * `/api/fees`: the usage-fee ledger. Staff who read loans see paid and owed for their schools
 * (waiver reasons only for coordinator and directors); the coordinator edits the schedule,
 * refunds and records payments taken by hand.
 */
export function feesRoutes(services: Services): Router {
  const { db, config } = services;
  const router = Router();
  const online = () => config.payments !== undefined;
  const [reads, manages] = [requires('loans:read'), requires('fees:manage')];
  router.get(
    '/fees/schedule',
    reads,
    withoutQuery(() => readFeeSchedule(db, online())),
  );
  router.put(
    '/fees/schedule',
    manages,
    answer((request, actor) => {
      const input = parseInput(feeScheduleSchema, request.body, 'The fee schedule');
      return writeFeeSchedule(db, actor, input, online());
    }),
  );
  router.get(
    '/fees',
    reads,
    answer((request, actor) => listFees(db, actor, request.query)),
  );
  router.get(
    '/fees/summary',
    reads,
    answer((request, actor) => {
      const { by } = parseInput(summarySchema, { by: request.query['by'] }, 'The summary');
      const { by: _by, ...rest } = request.query;
      return summariseFees(db, actor, by, rest);
    }),
  );
  router.get(
    '/fees/reconciliation',
    manages,
    withoutQuery(() => reconcile(db, config)),
  );
  router.get('/fees/export.csv', reads, exportRoute(db, 'csv'));
  router.get('/fees/export.xlsx', reads, exportRoute(db, 'xlsx'));
  router.get(
    '/fees/quote',
    requires('loans:write'),
    answer((request, actor) =>
      quoteLoanFee(db, actor, parseInput(feeQuoteQuerySchema, request.query, 'The fee quote')),
    ),
  );
  router.get(
    '/fees/:loanId',
    requires('loans:see-waivers'),
    withoutQuery((request, actor) => feeDetail(db, actor, idOf(request, 'loanId'))),
  );
  router.post(
    '/fees/:loanId/refunds',
    manages,
    answer((request, actor) => {
      const input = parseInput(refundInputSchema, request.body, 'The refund');
      return refundFee(db, config, actor, idOf(request, 'loanId'), input);
    }),
  );
  router.post(
    '/fees/:loanId/payments',
    manages,
    created((request, actor) => {
      const input = parseInput(manualPaymentInputSchema, request.body, 'The payment');
      return recordManualPayment(db, actor, idOf(request, 'loanId'), input);
    }),
  );
  router.post('/fees/:loanId/reminder', requires('loans:write'), answer(reminderRoute(services)));
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
