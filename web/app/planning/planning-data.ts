import { httpResource, type HttpResourceRef } from '@angular/common/http';
import { Injectable } from '@angular/core';
import {
  replacementPlanSchema,
  shortageReportSchema,
  type ReplacementPlan,
  type ShortageReport,
} from '@shared/api/planning';

/** The fleet's plans through `/api/planning`: replacement by depreciation, and shortages. */
@Injectable({ providedIn: 'root' })
export class FleetPlanning {
  /** The replacement plan, read once per call (in an injection context). */
  replacement(): HttpResourceRef<ReplacementPlan | undefined> {
    return httpResource(() => '/api/planning/replacement', {
      parse: (body) => replacementPlanSchema.parse(body),
    });
  }

  /** The shortages and transfers, read once per call (in an injection context). */
  shortages(): HttpResourceRef<ShortageReport | undefined> {
    return httpResource(() => '/api/planning/shortages', {
      parse: (body) => shortageReportSchema.parse(body),
    });
  }
}
