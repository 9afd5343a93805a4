import type { HttpResourceRef } from '@angular/common/http';
import { Injectable } from '@angular/core';
import { ApiData } from '../core/state/api-data';
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

const loanListSchema = listResponseSchema(loanSchema);

/** Loans of the fleet through `/api/loans`: check-out, return, reminders, agreements. */
@Injectable({ providedIn: 'root' })
export class FleetLoans extends ApiData {
  /** The loans the caller may see, newest first: a student's own, staff's within their schools. */
  recent(limit: number): HttpResourceRef<ListResponse<Loan> | undefined> {
    return this.resource(
      () => ({ url: '/api/loans', params: { limit, sort: 'checkedOutOn:desc' } }),
      loanListSchema,
    );
  }

  list(query: Record<string, string | number>): Observable<ListResponse<Loan>> {
    return this.read('/api/loans', loanListSchema, query);
  }

  get(id: number): Observable<Loan> {
    return this.read(`/api/loans/${id}`, loanSchema);
  }

  /** Lends an instrument; the server e-mails the guardian a one-time agreement link. */
  checkOut(input: CheckoutInput): Observable<Loan> {
    return this.write('POST', '/api/loans', input, loanSchema);
  }

  /** Takes a loan back: damage opens a repair ticket, a loss marks the instrument missing. */
  returnLoan(id: number, input: ReturnInput): Observable<Loan> {
    return this.write('POST', `/api/loans/${id}/return`, input, loanSchema);
  }

  remind(id: number): Observable<ReminderResult> {
    return this.write('POST', `/api/loans/${id}/reminder`, {}, reminderResultSchema);
  }

  /** Reminds the guardians of every overdue loan the user may see. */
  remindOverdue(): Observable<ReminderResult> {
    return this.write('POST', '/api/loans/overdue-reminders', {}, reminderResultSchema);
  }

  /** Sends the guardian a new agreement link (the old one stops working). */
  resendAgreement(id: number): Observable<unknown> {
    return this.http.post(`/api/loans/${id}/agreement-link`, {});
  }

  /** The address of the agreement PDF (signed, with the guardian's typed name and the time). */
  agreementPdfUrl(id: number): string {
    return `/api/loans/${id}/agreement.pdf`;
  }

  /** The agreement text in force, with its version. */
  agreementText(): HttpResourceRef<AgreementText | undefined> {
    return this.resource(() => '/api/loans/agreement-text', agreementTextSchema);
  }

  /** Replaces the agreement text; loans already signed keep the text they were signed with. */
  saveAgreementText(text: string): Observable<AgreementText> {
    return this.write('PUT', '/api/loans/agreement-text', { text }, agreementTextSchema);
  }
}
