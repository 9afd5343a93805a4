import { ChangeDetectionStrategy, Component, input, model } from '@angular/core';
import { MatButtonModule } from '@angular/material/button';

/**
 * The line under a table read a page at a time, newest first: which rows are shown of how many,
 * and the buttons to the newer and older pages. The page may add its own spacing (`.pager`).
 */
@Component({
  selector: 'tb-pager',
  imports: [MatButtonModule],
  template: `
    <span class="tb-muted">{{ offset() + 1 }}–{{ offset() + shown() }} of {{ total() }}</span>
    <button mat-button type="button" [disabled]="offset() === 0" (click)="turn(-1)">Newer</button>
    <button mat-button type="button" [disabled]="offset() + shown() >= total()" (click)="turn(1)">
      Older
    </button>
  `,
  styles: `
    :host {
      display: flex;
      justify-content: flex-end;
      align-items: center;
      gap: 8px;
    }
  `,
  changeDetection: ChangeDetectionStrategy.OnPush,
})
export class Pager {
  /** The first row's place in the whole list, from 0. */
  readonly offset = model.required<number>();
  readonly pageSize = input.required<number>();
  /** How many rows this page shows. */
  readonly shown = input.required<number>();
  /** How many rows there are in all. */
  readonly total = input.required<number>();

  protected turn(step: 1 | -1): void {
    this.offset.set(Math.max(0, this.offset() + step * this.pageSize()));
  }
}
