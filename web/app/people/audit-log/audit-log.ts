import { WhenPipe } from '../../core/format/formats';
import { ChangeDetectionStrategy, Component, inject, signal } from '@angular/core';
import { rxResource } from '@angular/core/rxjs-interop';
import { MatButtonModule } from '@angular/material/button';
import { MatFormFieldModule } from '@angular/material/form-field';
import { MatIconModule } from '@angular/material/icon';
import { MatSelectModule } from '@angular/material/select';
import type { AuditEntryRow } from '@shared/api/person';
import { Pager } from '../../core/pager/pager';
import { LoadFailed } from '../../core/state/load-failed';
import { PageState } from '../../core/state/page-state';
import { PeopleData } from '../people-data';
import {
  auditEntityLabel,
  auditEntityLabels,
  auditFieldChanges,
  auditSubject,
  type AuditFieldChange,
} from './audit-changes';
import { GridSearch } from '../../core/grid/grid-search/grid-search';

const pageSize = 50;

/** Recent changes across the district, newest first: when, who, what; before and after on demand. */
@Component({
  selector: 'tb-audit-log',
  imports: [
    GridSearch,
    LoadFailed,
    MatButtonModule,
    MatFormFieldModule,
    MatIconModule,
    MatSelectModule,
    Pager,
    PageState,
    WhenPipe,
  ],
  templateUrl: './audit-log.html',
  styleUrl: './audit-log.scss',
  changeDetection: ChangeDetectionStrategy.OnPush,
})
export class AuditLog {
  private readonly people = inject(PeopleData);

  protected readonly entities = Object.entries(auditEntityLabels);
  protected readonly entityLabel = auditEntityLabel;
  protected readonly search = signal('');
  protected readonly entity = signal('');
  protected readonly offset = signal(0);
  protected readonly expanded = signal<ReadonlySet<number>>(new Set());
  /** No entry opened: what turning the page leaves. */
  protected readonly collapsed: ReadonlySet<number> = new Set();
  protected readonly pageSize = pageSize;

  protected readonly list = rxResource({
    params: () => {
      const query: Record<string, string | number> = { offset: this.offset(), limit: pageSize };
      if (this.search().trim()) query['q'] = this.search().trim();
      if (this.entity()) query['entity'] = this.entity();
      return query;
    },
    stream: ({ params }) => this.people.audit(params),
  });

  protected filterBy(change: () => void): void {
    change();
    this.offset.set(0);
    this.expanded.set(new Set());
  }

  protected toggle(entry: AuditEntryRow): void {
    const next = new Set(this.expanded());
    if (next.has(entry.id)) next.delete(entry.id);
    else next.add(entry.id);
    this.expanded.set(next);
  }

  /** Who made the change; a sign-in is made by the person signing in, before they act. */
  protected who(entry: AuditEntryRow): string {
    return entry.userName ?? (entry.action === 'sign-in' ? (entry.entityName ?? '') : '');
  }

  protected subject(entry: AuditEntryRow): string {
    return entry.entityName ?? auditSubject(entry.before, entry.after);
  }

  protected changes(entry: AuditEntryRow): AuditFieldChange[] {
    return auditFieldChanges(entry.before, entry.after);
  }
}
