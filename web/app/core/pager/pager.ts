import { ChangeDetectionStrategy, Component, computed, input, model } from '@angular/core';
import { MatButtonModule } from '@angular/material/button';

/** A page of a list as the API answers it: the rows shown and how many there are in all. */
export interface ListPageRead {
  rows: readonly unknown[];
  total: number;
}

/**
 * The line under a table read a page at a time, newest first: which rows are shown of how many,
 * and the buttons to the newer and older pages. The page may add its own spacing (`.pager`).
 */
@Component({
  selector: 'tb-pager',
  imports: [MatButtonModule],
  template: `
    <span class="tb-muted">{{ offset() + 1 }}–{{ offset() + shown() }} of {{ page().total }}</span>
    <button mat-button type="button" [disabled]="offset() === 0" (click)="turn(-1)">Newer</button>
    <button
      mat-button
      type="button"
      [disabled]="offset() + shown() >= page().total"
      (click)="turn(1)"
    >
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
  /** The page shown: its rows, and how many there are in all. */
  readonly page = input.required<ListPageRead>();
  protected readonly shown = computed(() => this.page().rows.length);

  protected turn(step: 1 | -1): void {
    this.offset.set(Math.max(0, this.offset() + step * this.pageSize()));
  }
}
