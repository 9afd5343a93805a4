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
import { schoolInputSchema, schoolLevels, type School } from '../../../../shared/api/school';
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

  protected readonly form = inject(NonNullableFormBuilder).group({
    code: ['', schemaValidator(schoolInputSchema.shape.code)],
    name: ['', schemaValidator(schoolInputSchema.shape.name)],
    level: ['middle' as School['level'], schemaValidator(schoolInputSchema.shape.level)],
    address: ['', schemaValidator(schoolInputSchema.shape.address)],
  });

  constructor() {
    effect(() => {
      const id = this.id();
      untracked(() => (id === 'new' ? this.load.set({ kind: 'ready' }) : this.fetch(Number(id))));
    });
  }

  protected reload(): void {
    this.fetch(Number(this.id()));
  }

  protected save(): void {
    this.form.markAllAsTouched();
    if (this.form.invalid || this.saving()) return;
    const input = schoolInputSchema.parse(this.form.getRawValue());
    const current = this.school();
    this.saving.set(true);
    this.saved.set(false);
    this.saveError.set('');
    const request = current
      ? this.schoolData.update(current.id, { ...input, version: current.version })
      : this.schoolData.create(input);
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
    });
    if (!this.canWrite) this.form.disable();
  }
}
