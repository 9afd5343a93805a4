import { HttpParams } from '@angular/common/http';
import { Injectable } from '@angular/core';
import { ApiData } from '../core/state/api-data';
import type { Observable } from 'rxjs';
import { listResponseSchema, type ListResponse } from '@shared/api/list';
import {
  reportPreviewSchema,
  reportRunSchema,
  reportScheduleSchema,
  reportSendResultSchema,
  type ReportKind,
  type ReportRun,
  type ReportSchedule,
  type ReportScheduleInput,
  type ReportSendInput,
} from '@shared/api/report';
import { parsedWith } from '../core/parse';

/** What a preview asks for: the kind, the school of a director report, and the period. */
export interface PreviewRequest {
  kind: ReportKind;
  schoolId: number | null;
  from: string;
  to: string;
}

/** What the server queued for a send. */
export type SendResult = { outboxIds: number[]; runIds: number[] };

/** Previews, sends and schedules reports, and lists the reports sent. */
@Injectable({ providedIn: 'root' })
export class ReportData extends ApiData {
  preview(request: PreviewRequest) {
    const query: Record<string, string> = {
      kind: request.kind,
      from: request.from,
      to: request.to,
    };
    if (request.kind === 'director' && request.schoolId !== null)
      query['schoolId'] = String(request.schoolId);
    return this.read('/api/reports/preview', reportPreviewSchema, query);
  }

  send(input: ReportSendInput): Observable<SendResult> {
    return this.post('/api/reports/send', input, reportSendResultSchema);
  }

  runs(offset: number, limit: number): Observable<ListResponse<ReportRun>> {
    return this.http
      .get('/api/reports', {
        params: new HttpParams({ fromObject: { sort: 'createdAt:desc', offset, limit } }),
      })
      .pipe(parsedWith(listResponseSchema(reportRunSchema)));
  }

  schedules(): Observable<ListResponse<ReportSchedule>> {
    return this.http
      .get('/api/reports/schedules', { params: new HttpParams({ fromObject: { limit: 200 } }) })
      .pipe(parsedWith(listResponseSchema(reportScheduleSchema)));
  }

  createSchedule(input: ReportScheduleInput): Observable<ReportSchedule> {
    return this.post('/api/reports/schedules', input, reportScheduleSchema);
  }

  setScheduleActive(schedule: ReportSchedule, active: boolean): Observable<ReportSchedule> {
    return this.patch(
      `/api/reports/schedules/${schedule.id}`,
      { active, version: schedule.version },
      reportScheduleSchema,
    );
  }

  deleteSchedule(id: number): Observable<unknown> {
    return this.http.delete(`/api/reports/schedules/${id}`);
  }
}
