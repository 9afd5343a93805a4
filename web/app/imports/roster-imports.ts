import { HttpEventType, type HttpEvent } from '@angular/common/http';
import { Injectable } from '@angular/core';
import { ApiData } from '../core/state/api-data';
import { filter, map, type Observable } from 'rxjs';
import {
  importDetailSchema,
  importHistoryEntrySchema,
  importPresetSchema,
  importPreviewSchema,
  importResultSchema,
  importUndoResultSchema,
  type CommitRequest,
  type ImportDetail,
  type ImportHistoryEntry,
  type ImportPreset,
  type ImportPreview,
  type ImportResult,
  type ImportUndoResult,
} from '@shared/api/import';
import { listResponseSchema, type ListResponse } from '@shared/api/list';
import { orgMappingSchema, type OrgMapping, type OrgMappingInput } from '@shared/api/oneroster';
import type { ColumnMapping } from '@shared/roster/roster-columns';
import { parsedWith } from '../core/parse';

const historySchema = listResponseSchema(importHistoryEntrySchema);
const presetListSchema = listResponseSchema(importPresetSchema);

/** A preview on its way: upload progress (0 to 1), then the answer. */
export type PreviewProgress =
  { kind: 'progress'; share: number } | { kind: 'done'; preview: ImportPreview };

/** What a preview is asked for: a new file, or a kept upload with another mapping. */
export interface PreviewRequest {
  file?: File;
  importToken?: string;
  mapping?: ColumnMapping;
  withdrawMissing: boolean;
}

/** Roster uploads, commits, the import history and saved mappings, through `/api/imports`. */
@Injectable({ providedIn: 'root' })
export class RosterImports extends ApiData {
  preview(request: PreviewRequest): Observable<PreviewProgress> {
    const form = new FormData();
    if (request.file) form.append('file', request.file, request.file.name);
    if (request.importToken) form.append('importToken', request.importToken);
    if (request.mapping) form.append('mapping', JSON.stringify(request.mapping));
    form.append('withdrawMissing', String(request.withdrawMissing));
    return this.http
      .post('/api/imports/preview', form, { reportProgress: true, observe: 'events' })
      .pipe(
        filter(
          (event: HttpEvent<unknown>) =>
            event.type === HttpEventType.UploadProgress || event.type === HttpEventType.Response,
        ),
        map((event): PreviewProgress => {
          if (event.type === HttpEventType.UploadProgress) {
            return { kind: 'progress', share: event.total ? event.loaded / event.total : 0 };
          }
          return {
            kind: 'done',
            preview: importPreviewSchema.parse((event as { body: unknown }).body),
          };
        }),
      );
  }

  commit(request: CommitRequest): Observable<ImportResult> {
    return this.write('POST', '/api/imports/commit', request, importResultSchema);
  }

  history(
    query: Record<string, string | number> = {},
  ): Observable<ListResponse<ImportHistoryEntry>> {
    return this.read('/api/imports', historySchema, query);
  }

  detail(id: number): Observable<ImportDetail> {
    return this.read(`/api/imports/${id}`, importDetailSchema);
  }

  /** Takes a committed import back, all or nothing (the server refuses with what blocks it). */
  undo(id: number): Observable<ImportUndoResult> {
    return this.write('POST', `/api/imports/${id}/undo`, {}, importUndoResultSchema);
  }

  /** Where an import's error report downloads from. */
  errorReportUrl(id: number): string {
    return `/api/imports/${id}/errors.csv`;
  }

  presets(): Observable<ListResponse<ImportPreset>> {
    return this.read('/api/imports/presets', presetListSchema);
  }

  savePreset(name: string, mapping: ColumnMapping): Observable<ImportPreset> {
    return this.write('POST', '/api/imports/presets', { name, mapping }, importPresetSchema);
  }

  deletePreset(id: number): Observable<unknown> {
    return this.http.delete(`/api/imports/presets/${id}`);
  }

  /** Remembers the school a coordinator chose for a OneRoster org, for this and later imports. */
  chooseOrgSchool(input: OrgMappingInput): Observable<OrgMapping> {
    return this.http.put('/api/oneroster/org-mappings', input).pipe(parsedWith(orgMappingSchema));
  }
}
