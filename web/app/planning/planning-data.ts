import type { HttpResourceRef } from '@angular/common/http';
import { Injectable } from '@angular/core';
import {
  replacementPlanSchema,
  shortageReportSchema,
  type ReplacementPlan,
  type ShortageReport,
} from '@shared/api/planning';
import { ApiData } from '../core/state/api-data';

/** The fleet's plans through `/api/planning`: replacement by depreciation, and shortages. */
@Injectable({ providedIn: 'root' })
export class FleetPlanning extends ApiData {
  /** The replacement plan, read once per call (in an injection context). */
  replacement(): HttpResourceRef<ReplacementPlan | undefined> {
    return this.resource(() => '/api/planning/replacement', replacementPlanSchema);
  }

  /** The shortages and transfers, read once per call (in an injection context). */
  shortages(): HttpResourceRef<ShortageReport | undefined> {
    return this.resource(() => '/api/planning/shortages', shortageReportSchema);
  }
}
