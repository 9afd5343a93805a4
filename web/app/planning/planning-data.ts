import { HttpClient } from '@angular/common/http';
import { Injectable, inject } from '@angular/core';
import type { Observable } from 'rxjs';
import {
  replacementPlanSchema,
  shortageReportSchema,
  type ReplacementPlan,
  type ShortageReport,
} from '@shared/api/planning';
import { parsedWith } from '../core/parse';

/** The fleet's plans through `/api/planning`: replacement by depreciation, and shortages. */
@Injectable({ providedIn: 'root' })
export class FleetPlanning {
  private readonly http = inject(HttpClient);

  replacement(): Observable<ReplacementPlan> {
    return this.http.get('/api/planning/replacement').pipe(parsedWith(replacementPlanSchema));
  }

  shortages(): Observable<ShortageReport> {
    return this.http.get('/api/planning/shortages').pipe(parsedWith(shortageReportSchema));
  }
}
