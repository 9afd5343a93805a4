import { WhenPipe } from '../../core/format/formats';
import { ChangeDetectionStrategy, Component, computed, inject, signal } from '@angular/core';
import { rxResource } from '@angular/core/rxjs-interop';
import { MatButtonModule } from '@angular/material/button';
import { MatDialog } from '@angular/material/dialog';
import { dialogAnswer } from '../../core/confirm-dialog/dialog-answer';
import { MatFormFieldModule } from '@angular/material/form-field';
import { MatIconModule } from '@angular/material/icon';
import { MatInputModule } from '@angular/material/input';
import { MatSelectModule } from '@angular/material/select';
import type { Person } from '@shared/api/person';
import { roleLabels, roles, type Role } from '@shared/api/roles';
import { CurrentUser } from '../../core/auth/current-user';
import { errorMessage } from '../../core/parse';
import { LoadFailed } from '../../core/state/load-failed';
import { PageState } from '../../core/state/page-state';
import { injectSchoolChoices } from '../../schools/school-choices';
import { PeopleData } from '../people-data';
import { PersonDialog, type PersonDialogData } from '../person-dialog/person-dialog';
import { createWrite } from '../../core/state/write';
import { IconButton } from '../../core/icon-button/icon-button';

type SortField = 'name' | 'email' | 'role' | 'lastSignInAt';

/** Everyone who signs in: search, filters, sortable columns, add, edit, deactivate. */
@Component({
  selector: 'tb-person-list',
  imports: [
    IconButton,
    LoadFailed,
    MatButtonModule,
    MatFormFieldModule,
    MatIconModule,
    MatInputModule,
    MatSelectModule,
    PageState,
    WhenPipe,
  ],
  templateUrl: './person-list.html',
  styleUrl: './person-list.scss',
  changeDetection: ChangeDetectionStrategy.OnPush,
})
export class PersonList {
  private readonly write = createWrite();
  private readonly people = inject(PeopleData);
  private readonly dialog = inject(MatDialog);

  protected readonly myId = inject(CurrentUser).me()?.id;
  protected readonly roles = roles;
  protected readonly roleLabels = roleLabels;
  protected readonly schools = injectSchoolChoices();

  protected readonly search = signal('');
  protected readonly role = signal<Role | ''>('');
  protected readonly schoolId = signal<number | ''>('');
  protected readonly active = signal<'' | 'true' | 'false'>('');
  protected readonly sort = signal<{ field: SortField; direction: 'asc' | 'desc' }>({
    field: 'name',
    direction: 'asc',
  });
  protected readonly notice = signal('');
  protected readonly failure = signal('');
  protected readonly busy = signal<number | null>(null);

  private readonly query = computed(() => {
    const query: Record<string, string | number> = {
      sort: `${this.sort().field}:${this.sort().direction}`,
      limit: 500,
    };
    if (this.search().trim()) query['q'] = this.search().trim();
    if (this.role()) query['role'] = this.role();
    if (this.schoolId() !== '') query['schoolId'] = this.schoolId();
    if (this.active()) query['active'] = this.active();
    return query;
  });
  protected readonly list = rxResource({
    params: () => this.query(),
    stream: ({ params }) => this.people.list(params),
  });
  protected readonly filtered = computed(
    () => !!(this.search().trim() || this.role() || this.schoolId() !== '' || this.active()),
  );

  protected sortBy(field: SortField): void {
    const current = this.sort();
    this.sort.set({
      field,
      direction: current.field === field && current.direction === 'asc' ? 'desc' : 'asc',
    });
  }

  protected ariaSort(field: SortField): 'ascending' | 'descending' | null {
    const current = this.sort();
    if (current.field !== field) return null;
    return current.direction === 'asc' ? 'ascending' : 'descending';
  }

  protected clearFilters(): void {
    this.search.set('');
    this.role.set('');
    this.schoolId.set('');
    this.active.set('');
  }

  protected add(): void {
    void this.openDialog({ person: null });
  }

  protected edit(person: Person): void {
    void this.openDialog({ person });
  }

  protected setActive(person: Person, active: boolean): void {
    this.busy.set(person.id);
    this.failure.set('');
    this.write.send(this.people.update(person.id, { active, version: person.version }), {
      next: (changed) => {
        this.busy.set(null);
        this.notice.set(
          active
            ? `${changed.name} is active again and can sign in.`
            : `${changed.name} is deactivated: they can no longer sign in, and their API tokens stop working.`,
        );
        this.list.reload();
      },
      error: (error: unknown) => {
        this.busy.set(null);
        this.failure.set(errorMessage(error, `${person.name} could not be changed.`));
        this.list.reload();
      },
    });
  }

  private async openDialog(data: PersonDialogData): Promise<void> {
    const saved = await dialogAnswer<Person>(this.dialog, PersonDialog, {
      data,
      width: '560px',
      autoFocus: 'first-tabbable',
    });
    if (!saved) return;
    this.failure.set('');
    this.notice.set(
      data.person ? `${saved.name} is saved.` : `${saved.name} is added and can sign in now.`,
    );
    this.list.reload();
  }
}
