import {
  ChangeDetectionStrategy,
  Component,
  computed,
  input,
  model,
  type Resource,
} from '@angular/core';
import { Pager, type ListPageRead } from '../pager/pager';
import { PageState } from '../state/page-state';

/** How many rows a list table shows a page. */
export const listTablePageSize = 50;

/** What a list table says: its test id, states and column headings. */
export interface ListTableWords {
  /** The table's data-testid, for browser tests. */
  testId: string;
  /** The list, as it reads after "Loading" ("the outbox"); the error state's title starts with it. */
  what: string;
  /** The error state's message; "The server did not answer…reload the page." unless given. */
  failedMessage?: string;
  /** The column headings, left to right. */
  headings: readonly string[];
  /** The state shown when the list has no rows at all. */
  empty: { icon: string; title: string; message: string };
}

/**
 * A plain table of a list read a page at a time, newest first (the reports sent, the outbox):
 * its loading, error and empty states, the table with the caption the page projects (a hidden
 * one, `<caption class="tb-visually-hidden">`), its column headings, the rows the page projects
 * into its body, and the pager under it. The host takes no box of its own (`display: contents`),
 * so the page lays the table and the pager out as its own children; a page may set
 * `--tb-list-table-text` for the table's text size (0.875rem unless set) and `--tb-pager-gap`
 * for the room above the pager (8px unless set).
 */
@Component({
  selector: 'tb-list-table',
  imports: [Pager, PageState],
  template: `
    @let words = table();
    @if (list().error()) {
      <tb-page-state kind="error" [title]="failedTitle()" [message]="failedMessage()" />
    } @else if (list().value(); as page) {
      @if (page.total === 0) {
        <tb-page-state
          kind="empty"
          [icon]="words.empty.icon"
          [title]="words.empty.title"
          [message]="words.empty.message"
        />
      } @else {
        <table class="tb-list-table" [attr.data-testid]="words.testId">
          <ng-content select="caption" />
          <thead>
            <tr>
              @for (heading of words.headings; track $index) {
                <th scope="col">{{ heading }}</th>
              }
            </tr>
          </thead>
          <tbody>
            <ng-content />
          </tbody>
        </table>
        <tb-pager class="pager" [(offset)]="offset" [pageSize]="pageSize" [page]="page" />
      }
    } @else {
      <tb-page-state kind="loading" [title]="'Loading ' + words.what + '…'" />
    }
  `,
  styles: `
    :host {
      display: contents;
    }
    table {
      font-size: var(--tb-list-table-text, 0.875rem);
    }
    thead th {
      white-space: nowrap;
    }
    .pager {
      padding-top: var(--tb-pager-gap, 8px);
    }
  `,
  changeDetection: ChangeDetectionStrategy.OnPush,
})
export class ListTable {
  /** The read of the page shown. */
  readonly list = input.required<Resource<ListPageRead | undefined>>();
  readonly table = input.required<ListTableWords>();
  /** The first row's place in the whole list, from 0. */
  readonly offset = model.required<number>();
  protected readonly pageSize = listTablePageSize;

  protected readonly failedTitle = computed(() => {
    const what = this.table().what;
    return `${what.charAt(0).toUpperCase()}${what.slice(1)} could not be loaded`;
  });
  protected readonly failedMessage = computed(
    () =>
      this.table().failedMessage ??
      'The server did not answer. Check your connection and reload the page.',
  );
}
