import { httpResource } from '@angular/common/http';
import { Injectable, computed } from '@angular/core';
import * as z from 'zod';
import { takeSchema, type Take } from '@shared/api/take';
import { cellKey } from './entry-cells';

/** The takes students sent to the director, by entry-grid cell (student and requirement). */
@Injectable()
export class SentTakes {
  private readonly takes = httpResource(() => '/api/takes', {
    parse: (body) => z.array(takeSchema).parse(body),
  });

  /** Sent takes per cell key, newest first. */
  readonly byCell = computed(() => {
    const cells = new Map<string, Take[]>();
    const takes = this.takes.hasValue() ? this.takes.value() : [];
    for (const take of takes) {
      const key = cellKey(take.studentId, take.requirementCode);
      cells.set(key, [...(cells.get(key) ?? []), take]);
    }
    return cells;
  });
}
