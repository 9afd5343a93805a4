import {
  ChangeDetectionStrategy,
  Component,
  computed,
  effect,
  inject,
  input,
  signal,
  untracked,
} from '@angular/core';
import { NonNullableFormBuilder, ReactiveFormsModule } from '@angular/forms';
import { MatButtonModule } from '@angular/material/button';
import { MatFormFieldModule } from '@angular/material/form-field';
import { MatIconModule } from '@angular/material/icon';
import { MatInputModule } from '@angular/material/input';
import { MatSelectModule } from '@angular/material/select';
import { Router, RouterLink } from '@angular/router';
import type { Ensemble } from '../../../../shared/api/ensemble';
import {
  gradeLabel,
  schoolInputSchema,
  schoolLevels,
  type School,
  type SchoolSummaryRow,
} from '../../../../shared/api/school';
import { CurrentUser } from '../../core/auth/current-user';
import { fieldMessage, saveFailureMessage, schemaValidator } from '../../core/forms/record-form';
import { errorMessage } from '../../core/parse';
import { PageState } from '../../core/state/page-state';
import { EnsembleData } from '../../ensembles/ensemble-data';
import { SchoolData } from '../school-data';
import { schoolLevelLabels } from '../school-labels';

type Load = { kind: 'loading' } | { kind: 'error'; message: string } | { kind: 'ready' };

/** One school: its details (the coordinator edits them), its ensembles and a way to its students. */
@Component({
  selector: 'tb-school-detail',
  imports: [
    ReactiveFormsModule,
    RouterLink,
    MatButtonModule,
    MatFormFieldModule,
    MatIconModule,
    MatInputModule,
    MatSelectModule,
    PageState,
  ],
  templateUrl: './school-detail.html',
  styleUrl: './school-detail.scss',
  changeDetection: ChangeDetectionStrategy.OnPush,
})
export class SchoolDetail {
  private readonly schoolData = inject(SchoolData);
  private readonly ensembleData = inject(EnsembleData);
  private readonly router = inject(Router);

  /** The route's `:id`, or 'new' for the create page. */
  readonly id = input.required<string>();

  protected readonly canWrite = inject(CurrentUser).can('schools:write');
  protected readonly creating = computed(() => this.id() === 'new');
  protected readonly levels = schoolLevels;
  protected readonly levelLabels = schoolLevelLabels;
  protected readonly load = signal<Load>({ kind: 'loading' });
  protected readonly school = signal<School | null>(null);
  protected readonly ensembles = signal<Ensemble[] | null>(null);
  protected readonly saving = signal(false);
  protected readonly saved = signal(false);
  protected readonly conflict = signal(false);
  protected readonly saveError = signal('');
  protected readonly fieldMessage = fieldMessage;
  protected readonly grades = Array.from({ length: 13 }, (_, grade) => grade);
  protected readonly gradeLabel = gradeLabel;
  /** The open schools students may move up to (the school itself left out). */
  protected readonly otherSchools = signal<SchoolSummaryRow[]>([]);
  protected readonly closingOn = signal(new Date().toISOString().slice(0, 10));

  protected readonly form = inject(NonNullableFormBuilder).group({
    code: ['', schemaValidator(schoolInputSchema.shape.code)],
    name: ['', schemaValidator(schoolInputSchema.shape.name)],
    level: ['middle' as School['level'], schemaValidator(schoolInputSchema.shape.level)],
    address: ['', schemaValidator(schoolInputSchema.shape.address)],
    lowestGrade: [null as number | null],
    highestGrade: [null as number | null],
    sendsToSchoolId: [null as number | null],
  });

  constructor() {
    effect(() => {
      const id = this.id();
      untracked(() => (id === 'new' ? this.load.set({ kind: 'ready' }) : this.fetch(Number(id))));
      untracked(() => this.fetchOtherSchools(id === 'new' ? null : Number(id)));
    });
  }

  private fetchOtherSchools(selfId: number | null): void {
    this.schoolData.list({ status: 'open', sort: 'name:asc', limit: 500 }).subscribe({
      next: (list) =>
        this.otherSchools.set(
          list.rows
            .filter((school) => school.id !== selfId)
            .map(({ id, code, name }) => ({ id, code, name })),
        ),
      error: () => this.otherSchools.set([]),
    });
  }

  /** Closes the school on the chosen day, or opens it again (closedOn null). */
  protected setClosed(closedOn: string | null): void {
    const current = this.school();
    if (!current || this.saving()) return;
    this.saving.set(true);
    this.saveError.set('');
    this.schoolData.update(current.id, { closedOn, version: current.version }).subscribe({
      next: (school) => {
        this.saving.set(false);
        this.show(school);
      },
      error: (error: unknown) => {
        this.saving.set(false);
        this.saveError.set(saveFailureMessage(this.form, error, this.conflict));
      },
    });
  }

  protected reload(): void {
    this.fetch(Number(this.id()));
  }

  protected save(): void {
    this.form.markAllAsTouched();
    if (this.form.invalid || this.saving()) return;
    const parsed = schoolInputSchema.safeParse(this.form.getRawValue());
    if (!parsed.success) {
      this.saveError.set(parsed.error.issues[0]?.message ?? 'Check the form.');
      return;
    }
    const current = this.school();
    const { closedOn: _closedOn, ...input } = parsed.data;
    this.saving.set(true);
    this.saved.set(false);
    this.saveError.set('');
    const request = current
      ? this.schoolData.update(current.id, { ...input, version: current.version })
      : this.schoolData.create(parsed.data);
    request.subscribe({
      next: (school) => {
        this.saving.set(false);
        if (!current) {
          void this.router.navigate(['/schools', school.id]);
          return;
        }
        this.show(school);
        this.saved.set(true);
      },
      error: (error: unknown) => {
        this.saving.set(false);
        this.saveError.set(saveFailureMessage(this.form, error, this.conflict));
      },
    });
  }

  private fetch(id: number): void {
    this.load.set({ kind: 'loading' });
    this.conflict.set(false);
    this.schoolData.get(id).subscribe({
      next: (school) => {
        this.show(school);
        this.load.set({ kind: 'ready' });
      },
      error: (error: unknown) =>
        this.load.set({
          kind: 'error',
          message: errorMessage(error, 'The school could not be loaded.'),
        }),
    });
    this.ensembleData.list({ schoolId: id, sort: 'name:asc', limit: 200 }).subscribe({
      next: (list) => this.ensembles.set(list.rows),
      error: () => this.ensembles.set([]),
    });
  }

  private show(school: School): void {
    this.school.set(school);
    this.form.reset({
      code: school.code,
      name: school.name,
      level: school.level,
      address: school.address,
      lowestGrade: school.lowestGrade,
      highestGrade: school.highestGrade,
      sendsToSchoolId: school.sendsToSchoolId,
    });
    if (!this.canWrite) this.form.disable();
  }
}
