import { HttpParams, type HttpResourceRef } from '@angular/common/http';
import { Injectable } from '@angular/core';
import { ApiData } from '../core/state/api-data';
import type { Observable } from 'rxjs';
import {
  feeDetailSchema,
  feeListSchema,
  feeQuoteSchema,
  feeRowSchema,
  feeScheduleSchema,
  feeSummarySchema,
  reconciliationSchema,
  type FeeDetail,
  type FeeList,
  type FeeQuote,
  type FeeRow,
  type FeeSchedule,
  type FeeSummary,
  type Reconciliation,
  type RefundInput,
} from '@shared/api/fee';
import { reminderResultSchema, type ReminderResult } from '@shared/api/loan';

/** Usage fees through `/api/fees`: the ledger, refunds, payments by hand and the schedule. */
@Injectable({ providedIn: 'root' })
export class FeeLedger extends ApiData {
  /** The fees matching `query()`, read again whenever it changes. */
  list(query: () => Record<string, string | number>): HttpResourceRef<FeeList | undefined> {
    return this.resource(() => ({ url: '/api/fees', params: query() }), feeListSchema);
  }

  /** The fees matching `query()` grouped by `by()`; idle while `by()` is undefined. */
  summary(
    by: () => FeeSummary['by'] | undefined,
    query: () => Record<string, string | number>,
  ): HttpResourceRef<FeeSummary | undefined> {
    return this.resource(() => {
      const group = by();
      return group === undefined
        ? undefined
        : { url: '/api/fees/summary', params: { ...query(), by: group } };
    }, feeSummarySchema);
  }

  /** The ledger of loan `loanId()`; idle while it is undefined. */
  detail(loanId: () => number | undefined): HttpResourceRef<FeeDetail | undefined> {
    return this.resource(
      () => (loanId() === undefined ? undefined : `/api/fees/${loanId()}`),
      feeDetailSchema,
    );
  }

  refund(loanId: number, input: RefundInput): Observable<FeeRow> {
    return this.write('POST', `/api/fees/${loanId}/refunds`, input, feeRowSchema);
  }

  recordPayment(loanId: number, amountCents: number, note: string): Observable<FeeRow> {
    return this.write('POST', `/api/fees/${loanId}/payments`, { amountCents, note }, feeRowSchema);
  }

  remind(loanId: number): Observable<ReminderResult> {
    return this.write('POST', `/api/fees/${loanId}/reminder`, {}, reminderResultSchema);
  }

  /** The reconciliation with the payment service, asked once `asked()` turns true. */
  reconciliation(asked: () => boolean): HttpResourceRef<Reconciliation | undefined> {
    return this.resource(
      () => (asked() ? '/api/fees/reconciliation' : undefined),
      reconciliationSchema,
    );
  }

  /** The district's usage-fee schedule. */
  schedule(): HttpResourceRef<FeeSchedule | undefined> {
    return this.resource(() => '/api/fees/schedule', feeScheduleSchema);
  }

  saveSchedule(schedule: FeeSchedule): Observable<FeeSchedule> {
    return this.write('PUT', '/api/fees/schedule', schedule, feeScheduleSchema);
  }

  /** The fee the schedule gives for the pair `chosen()` names; idle while it is undefined. */
  quote(
    chosen: () => { instrumentId: number; studentId: number } | undefined,
  ): HttpResourceRef<FeeQuote | undefined> {
    return this.resource(() => {
      const params = chosen();
      return params ? { url: '/api/fees/quote', params } : undefined;
    }, feeQuoteSchema);
  }

  exportUrl(format: 'csv' | 'xlsx', query: Record<string, string | number>): string {
    const params = new HttpParams({ fromObject: query }).toString();
    return `/api/fees/export.${format}${params ? `?${params}` : ''}`;
  }
}
