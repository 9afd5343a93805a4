import { HttpClient, HttpParams, httpResource, type HttpResourceRef } from '@angular/common/http';
import { Injectable, inject } from '@angular/core';
import type { Observable } from 'rxjs';
import {
  feeDetailSchema,
  feeListSchema,
  feeRowSchema,
  feeScheduleSchema,
  feeSummarySchema,
  reconciliationSchema,
  type FeeDetail,
  type FeeList,
  type FeeRow,
  type FeeSchedule,
  type FeeSummary,
  type Reconciliation,
  type RefundInput,
} from '@shared/api/fee';
import { reminderResultSchema, type ReminderResult } from '@shared/api/loan';
import { parsedWith } from '../core/parse';

/** Usage fees through `/api/fees`: the ledger, refunds, payments by hand and the schedule. */
@Injectable({ providedIn: 'root' })
export class FeeLedger {
  private readonly http = inject(HttpClient);

  /** The fees matching `query()`, read again whenever it changes. */
  list(query: () => Record<string, string | number>): HttpResourceRef<FeeList | undefined> {
    return httpResource(() => ({ url: '/api/fees', params: query() }), {
      parse: (body) => feeListSchema.parse(body),
    });
  }

  /** The fees matching `query()` grouped by `by()`; idle while `by()` is undefined. */
  summary(
    by: () => FeeSummary['by'] | undefined,
    query: () => Record<string, string | number>,
  ): HttpResourceRef<FeeSummary | undefined> {
    return httpResource(
      () => {
        const group = by();
        return group === undefined
          ? undefined
          : { url: '/api/fees/summary', params: { ...query(), by: group } };
      },
      { parse: (body) => feeSummarySchema.parse(body) },
    );
  }

  /** The ledger of loan `loanId()`; idle while it is undefined. */
  detail(loanId: () => number | undefined): HttpResourceRef<FeeDetail | undefined> {
    return httpResource(() => (loanId() === undefined ? undefined : `/api/fees/${loanId()}`), {
      parse: (body) => feeDetailSchema.parse(body),
    });
  }

  refund(loanId: number, input: RefundInput): Observable<FeeRow> {
    return this.http.post(`/api/fees/${loanId}/refunds`, input).pipe(parsedWith(feeRowSchema));
  }

  recordPayment(loanId: number, amountCents: number, note: string): Observable<FeeRow> {
    return this.http
      .post(`/api/fees/${loanId}/payments`, { amountCents, note })
      .pipe(parsedWith(feeRowSchema));
  }

  remind(loanId: number): Observable<ReminderResult> {
    return this.http
      .post(`/api/fees/${loanId}/reminder`, {})
      .pipe(parsedWith(reminderResultSchema));
  }

  /** The reconciliation with the payment service, asked once `asked()` turns true. */
  reconciliation(asked: () => boolean): HttpResourceRef<Reconciliation | undefined> {
    return httpResource(() => (asked() ? '/api/fees/reconciliation' : undefined), {
      parse: (body) => reconciliationSchema.parse(body),
    });
  }

  saveSchedule(schedule: FeeSchedule): Observable<FeeSchedule> {
    return this.http.put('/api/fees/schedule', schedule).pipe(parsedWith(feeScheduleSchema));
  }

  exportUrl(format: 'csv' | 'xlsx', query: Record<string, string | number>): string {
    const params = new HttpParams({ fromObject: query }).toString();
    return `/api/fees/export.${format}${params ? `?${params}` : ''}`;
  }
}
