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
    return this.write('POST', '/api/reports/send', input, reportSendResultSchema);
  }

  runs(offset: number, limit: number): Observable<ListResponse<ReportRun>> {
    const query = { sort: 'createdAt:desc', offset, limit };
    return this.read('/api/reports', listResponseSchema(reportRunSchema), query);
  }

  schedules(): Observable<ListResponse<ReportSchedule>> {
    return this.read('/api/reports/schedules', listResponseSchema(reportScheduleSchema), {
      limit: 200,
    });
  }

  createSchedule(input: ReportScheduleInput): Observable<ReportSchedule> {
    return this.write('POST', '/api/reports/schedules', input, reportScheduleSchema);
  }

  setScheduleActive(schedule: ReportSchedule, active: boolean): Observable<ReportSchedule> {
    return this.write(
      'PATCH',
      `/api/reports/schedules/${schedule.id}`,
      { active, version: schedule.version },
      reportScheduleSchema,
    );
  }

  deleteSchedule(id: number): Observable<unknown> {
    return this.http.delete(`/api/reports/schedules/${id}`);
  }
}
