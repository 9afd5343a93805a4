import { HttpClient, HttpParams } from '@angular/common/http';
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

  list(query: Record<string, string | number>): Observable<FeeList> {
    return this.http
      .get('/api/fees', { params: new HttpParams({ fromObject: query }) })
      .pipe(parsedWith(feeListSchema));
  }

  summary(by: FeeSummary['by'], query: Record<string, string | number>): Observable<FeeSummary> {
    return this.http
      .get('/api/fees/summary', { params: new HttpParams({ fromObject: { ...query, by } }) })
      .pipe(parsedWith(feeSummarySchema));
  }

  detail(loanId: number): Observable<FeeDetail> {
    return this.http.get(`/api/fees/${loanId}`).pipe(parsedWith(feeDetailSchema));
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

  reconciliation(): Observable<Reconciliation> {
    return this.http.get('/api/fees/reconciliation').pipe(parsedWith(reconciliationSchema));
  }

  saveSchedule(schedule: FeeSchedule): Observable<FeeSchedule> {
    return this.http.put('/api/fees/schedule', schedule).pipe(parsedWith(feeScheduleSchema));
  }

  exportUrl(format: 'csv' | 'xlsx', query: Record<string, string | number>): string {
    const params = new HttpParams({ fromObject: query }).toString();
    return `/api/fees/export.${format}${params ? `?${params}` : ''}`;
  }
}
