import { HttpClient, HttpParams, httpResource, type HttpResourceRef } from '@angular/common/http';
import { Injectable, inject } from '@angular/core';
import type { Observable } from 'rxjs';
import { listResponseSchema, type ListResponse } from '@shared/api/list';
import {
  agreementTextSchema,
  loanSchema,
  type AgreementText,
  reminderResultSchema,
  type CheckoutInput,
  type Loan,
  type ReminderResult,
  type ReturnInput,
} from '@shared/api/loan';
import { parsedWith } from '../core/parse';

const loanListSchema = listResponseSchema(loanSchema);

/** Loans of the fleet through `/api/loans`: check-out, return, reminders, agreements. */
@Injectable({ providedIn: 'root' })
export class FleetLoans {
  private readonly http = inject(HttpClient);

  /** The loans the caller may see, newest first: a student's own, staff's within their schools. */
  recent(limit: number): HttpResourceRef<ListResponse<Loan> | undefined> {
    return httpResource(
      () => ({ url: '/api/loans', params: { limit, sort: 'checkedOutOn:desc' } }),
      { parse: (body) => loanListSchema.parse(body) },
    );
  }

  list(query: Record<string, string | number>): Observable<ListResponse<Loan>> {
    return this.http
      .get('/api/loans', { params: new HttpParams({ fromObject: query }) })
      .pipe(parsedWith(loanListSchema));
  }

  get(id: number): Observable<Loan> {
    return this.http.get(`/api/loans/${id}`).pipe(parsedWith(loanSchema));
  }

  /** Lends an instrument; the server e-mails the guardian a one-time agreement link. */
  checkOut(input: CheckoutInput): Observable<Loan> {
    return this.http.post('/api/loans', input).pipe(parsedWith(loanSchema));
  }

  /** Takes a loan back: damage opens a repair ticket, a loss marks the instrument missing. */
  returnLoan(id: number, input: ReturnInput): Observable<Loan> {
    return this.http.post(`/api/loans/${id}/return`, input).pipe(parsedWith(loanSchema));
  }

  remind(id: number): Observable<ReminderResult> {
    return this.http.post(`/api/loans/${id}/reminder`, {}).pipe(parsedWith(reminderResultSchema));
  }

  /** Reminds the guardians of every overdue loan the user may see. */
  remindOverdue(): Observable<ReminderResult> {
    return this.http
      .post('/api/loans/overdue-reminders', {})
      .pipe(parsedWith(reminderResultSchema));
  }

  /** Sends the guardian a new agreement link (the old one stops working). */
  resendAgreement(id: number): Observable<unknown> {
    return this.http.post(`/api/loans/${id}/agreement-link`, {});
  }

  /** The address of the agreement PDF (signed, with the guardian's typed name and the time). */
  agreementPdfUrl(id: number): string {
    return `/api/loans/${id}/agreement.pdf`;
  }

  /** Replaces the agreement text; loans already signed keep the text they were signed with. */
  saveAgreementText(text: string): Observable<AgreementText> {
    return this.http
      .put('/api/loans/agreement-text', { text })
      .pipe(parsedWith(agreementTextSchema));
  }
}
