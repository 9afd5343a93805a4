import { ChangeDetectionStrategy, Component, inject } from '@angular/core';
import { MAT_BOTTOM_SHEET_DATA, MatBottomSheetRef } from '@angular/material/bottom-sheet';
import { MatButtonModule } from '@angular/material/button';
import { MatIconModule } from '@angular/material/icon';
import type { RowDetail } from './row-detail';

/** What the sheet shows: what one row is ('student'), the row read out, the open button's words. */
export interface RowDetailSheetData {
  itemName: string;
  detail: RowDetail;
  openLabel: string;
}

/**
 * The rest of a grid row on a phone, in a bottom sheet (Material Design 3, "Bottom sheets"): the
 * columns the narrow screen leaves out, each with its heading, and a button to the row's own
 * page. Dismissed with true when the user asks for that page.
 */
@Component({
  selector: 'tb-row-detail-sheet',
  imports: [MatButtonModule, MatIconModule],
  template: `
    <header>
      <span class="kind">{{ data.itemName }}</span>
      <h2 id="row-detail-title" data-testid="row-detail-title">{{ data.detail.title }}</h2>
    </header>
    @if (data.detail.fields.length) {
      <dl data-testid="row-detail-fields">
        @for (field of data.detail.fields; track $index) {
          <div class="field">
            <dt>{{ field.label }}</dt>
            <dd [class.tb-muted]="!field.value">{{ field.value || '—' }}</dd>
          </div>
        }
      </dl>
    }
    <div class="actions">
      <button mat-button type="button" (click)="sheet.dismiss(false)">Close</button>
      <button
        mat-flat-button
        type="button"
        (click)="sheet.dismiss(true)"
        data-testid="row-detail-open"
      >
        {{ data.openLabel }}<mat-icon svgIcon="chevron_right" iconPositionEnd />
      </button>
    </div>
  `,
  styles: `
    :host {
      display: block;
      padding: 8px 4px 12px;
    }
    header {
      padding-bottom: 8px;
      border-bottom: 1px solid var(--tb-line);
    }
    .kind {
      font-size: 0.75rem;
      font-weight: 600;
      letter-spacing: 0.06em;
      text-transform: uppercase;
      color: var(--tb-text-muted);
    }
    h2 {
      margin: 2px 0 0;
      font-size: 1.15rem;
      font-weight: 600;
      line-height: 1.35;
      overflow-wrap: anywhere;
    }
    dl {
      margin: 0;
    }
    .field {
      display: grid;
      grid-template-columns: minmax(7rem, 38%) 1fr;
      gap: 12px;
      padding: 10px 0;
      border-bottom: 1px solid var(--tb-line);
    }
    dt {
      color: var(--tb-text-muted);
    }
    dd {
      margin: 0;
      overflow-wrap: anywhere;
    }
    .actions {
      display: flex;
      justify-content: flex-end;
      gap: 8px;
      padding-top: 12px;
      button {
        min-height: 48px;
      }
    }
  `,
  changeDetection: ChangeDetectionStrategy.OnPush,
})
export class RowDetailSheet {
  protected readonly data = inject<RowDetailSheetData>(MAT_BOTTOM_SHEET_DATA);
  protected readonly sheet = inject<MatBottomSheetRef<RowDetailSheet, boolean>>(MatBottomSheetRef);
}
