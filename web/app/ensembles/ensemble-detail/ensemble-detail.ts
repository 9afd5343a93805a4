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
import { toSignal } from '@angular/core/rxjs-interop';
import { NonNullableFormBuilder, ReactiveFormsModule } from '@angular/forms';
import { MatButtonModule } from '@angular/material/button';
import { MatFormFieldModule } from '@angular/material/form-field';
import { MatIconModule } from '@angular/material/icon';
import { MatInputModule } from '@angular/material/input';
import { MatSelectModule } from '@angular/material/select';
import { Router, RouterLink } from '@angular/router';
import { catchError, map, of } from 'rxjs';
import {
  ensembleInputSchema,
  ensembleKindLabels,
  ensembleKinds,
  type EnsembleDetail as Detail,
  type EnsembleKind,
} from '../../../../shared/api/ensemble';
import { CurrentUser } from '../../core/auth/current-user';
import { fieldMessage, saveFailureMessage, schemaValidator } from '../../core/forms/record-form';
import { chooseOnlySchool } from '../../core/forms/only-school';
import { errorMessage } from '../../core/parse';
import { PageState } from '../../core/state/page-state';
import { SchoolData } from '../../schools/school-data';
import { EnsembleData } from '../ensemble-data';

type Load = { kind: 'loading' } | { kind: 'error'; message: string } | { kind: 'ready' };

/** One ensemble: its details (directors and the coordinator edit them) and its members. */
@Component({
  selector: 'tb-ensemble-detail',
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
  templateUrl: './ensemble-detail.html',
  styleUrl: './ensemble-detail.scss',
  changeDetection: ChangeDetectionStrategy.OnPush,
})
export class EnsembleDetail {
  private readonly ensembleData = inject(EnsembleData);
  private readonly router = inject(Router);

  /** The route's `:id`, or 'new' for the create page. */
  readonly id = input.required<string>();

  protected readonly canWrite = inject(CurrentUser).can('roster:write');
  protected readonly creating = computed(() => this.id() === 'new');
  protected readonly schools = toSignal(
    inject(SchoolData)
      .list({ limit: 200, sort: 'name:asc' })
      .pipe(
        map((list) => list.rows),
        catchError(() => of([])),
      ),
    { initialValue: [] },
  );
  protected readonly kinds = ensembleKinds;
  protected readonly kindLabels = ensembleKindLabels;
  protected readonly load = signal<Load>({ kind: 'loading' });
  protected readonly ensemble = signal<Detail | null>(null);
  protected readonly saving = signal(false);
  protected readonly saved = signal(false);
  protected readonly conflict = signal(false);
  protected readonly saveError = signal('');
  protected readonly fieldMessage = fieldMessage;

  protected readonly form = inject(NonNullableFormBuilder).group({
    schoolId: [null as number | null, schemaValidator(ensembleInputSchema.shape.schoolId)],
    name: ['', schemaValidator(ensembleInputSchema.shape.name)],
    kind: ['concert-band' as EnsembleKind, schemaValidator(ensembleInputSchema.shape.kind)],
    level: ['', schemaValidator(ensembleInputSchema.shape.level)],
    meetingPeriod: ['', schemaValidator(ensembleInputSchema.shape.meetingPeriod)],
  });

  constructor() {
    // Form methods read the controls' own signals: untracked, so typing never re-runs these.
    effect(() => {
      const id = this.id();
      untracked(() => (id === 'new' ? this.load.set({ kind: 'ready' }) : this.fetch(Number(id))));
    });
    chooseOnlySchool(this.schools, this.creating, this.form.controls.schoolId);
  }

  protected reload(): void {
    this.fetch(Number(this.id()));
  }

  protected save(): void {
    this.form.markAllAsTouched();
    if (this.form.invalid || this.saving()) return;
    const { schoolId, ...fields } = this.form.getRawValue();
    const current = this.ensemble();
    this.saving.set(true);
    this.saved.set(false);
    this.saveError.set('');
    const request = current
      ? this.ensembleData.update(current.id, { ...fields, version: current.version })
      : this.ensembleData.create(ensembleInputSchema.parse({ ...fields, schoolId }));
    request.subscribe({
      next: (ensemble) => {
        this.saving.set(false);
        if (!current) {
          void this.router.navigate(['/ensembles', ensemble.id]);
          return;
        }
        this.saved.set(true);
        this.fetch(current.id);
      },
      error: (error: unknown) => {
        this.saving.set(false);
        this.saveError.set(saveFailureMessage(this.form, error, this.conflict));
      },
    });
  }

  private fetch(id: number): void {
    if (!this.ensemble()) this.load.set({ kind: 'loading' });
    this.conflict.set(false);
    this.ensembleData.get(id).subscribe({
      next: (ensemble) => {
        this.ensemble.set(ensemble);
        this.form.reset({
          schoolId: ensemble.schoolId,
          name: ensemble.name,
          kind: ensemble.kind,
          level: ensemble.level,
          meetingPeriod: ensemble.meetingPeriod,
        });
        this.form.controls.schoolId.disable();
        if (!this.canWrite) this.form.disable();
        this.load.set({ kind: 'ready' });
      },
      error: (error: unknown) =>
        this.load.set({
          kind: 'error',
          message: errorMessage(error, 'The ensemble could not be loaded.'),
        }),
    });
  }
}
