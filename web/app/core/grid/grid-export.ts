import { HttpClient } from '@angular/common/http';
import { Injectable, inject } from '@angular/core';
import { firstValueFrom } from 'rxjs';
import { listResponseSchema } from '@shared/api/list';
import * as z from 'zod';
import { gridCsv, type CsvColumn } from './grid-csv';
import { listParameters, type GridFilters } from './grid-query';

const pageSchema = listResponseSchema(z.record(z.string(), z.unknown()));

/** The largest page the list routes answer. */
const exportPageSize = 1000;

/** What to export: the list, its current search, filters and sort, and the visible columns. */
export interface GridExportRequest {
  endpoint: string;
  quickSearch?: string;
  filters?: GridFilters;
  sort?: string;
  columns: CsvColumn<Record<string, unknown>>[];
  /** Told after each page, with the rows fetched so far and the total. */
  progress?: (fetched: number, total: number) => void;
}

/** Exports the current view of a server-paged grid as CSV, fetching every row page by page. */
@Injectable({ providedIn: 'root' })
export class GridExport {
  private readonly http = inject(HttpClient);

  /** Every row of the view, fetched in pages in the view's order. */
  async rows(request: GridExportRequest): Promise<Record<string, unknown>[]> {
    const rows: Record<string, unknown>[] = [];
    let total = Infinity;
    while (rows.length < total) {
      const parameters = listParameters({ ...request, offset: rows.length, limit: exportPageSize });
      const page = pageSchema.parse(
        await firstValueFrom(this.http.get(request.endpoint, { params: parameters })),
      );
      total = page.total;
      rows.push(...page.rows);
      request.progress?.(rows.length, total);
      if (page.rows.length === 0) break;
    }
    return rows;
  }

  /** Fetches the view and hands the browser a CSV file of it. */
  async download(request: GridExportRequest, fileName: string): Promise<number> {
    const rows = await this.rows(request);
    // A byte-order mark lets spreadsheet programs read the file as UTF-8 (common practice, no source).
    const blob = new Blob(['\uFEFF', gridCsv(request.columns, rows)], {
      type: 'text/csv;charset=utf-8',
    });
    const url = URL.createObjectURL(blob);
    const link = document.createElement('a');
    link.href = url;
    link.download = fileName;
    link.click();
    // Revoked later: a browser may still be reading the file when click() returns.
    setTimeout(() => URL.revokeObjectURL(url), 60_000);
    return rows.length;
  }
}
