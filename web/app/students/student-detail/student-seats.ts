import {
  ChangeDetectionStrategy,
  Component,
  computed,
  inject,
  input,
  output,
  signal,
} from '@angular/core';
import { NonNullableFormBuilder, ReactiveFormsModule } from '@angular/forms';
import { MatButtonModule } from '@angular/material/button';
import { MatFormFieldModule } from '@angular/material/form-field';
import { MatIconModule } from '@angular/material/icon';
import { MatInputModule } from '@angular/material/input';
import { MatSelectModule, type MatSelectChange } from '@angular/material/select';
import { RouterLink } from '@angular/router';
import { enrollmentInputSchema } from '@shared/api/enrollment';
import type { Ensemble } from '@shared/api/ensemble';
import type { StudentDetail, StudentEnrollment } from '@shared/api/student';
import { instruments } from '@shared/music/instrument-data';
import {
  fieldMessage,
  isConflict,
  schemaValidator,
  showFieldErrors,
} from '../../core/forms/record-form';
import { errorMessage } from '../../core/parse';
import { EnsembleData } from '../../ensembles/ensemble-data';
import { EnrollmentData } from './enrollment-data';
import { createWrite } from '../../core/state/write';

const seatFields = enrollmentInputSchema.shape;

/** A student's seats in ensembles: change the instrument, take the student out, seat them anew. */
@Component({
  selector: 'tb-student-seats',
  imports: [
    ReactiveFormsModule,
    RouterLink,
    MatButtonModule,
    MatFormFieldModule,
    MatIconModule,
    MatInputModule,
    MatSelectModule,
  ],
  templateUrl: './student-seats.html',
  styleUrl: './student-seats.scss',
  changeDetection: ChangeDetectionStrategy.OnPush,
})
export class StudentSeats {
  private readonly write = createWrite();
  private readonly enrollmentData = inject(EnrollmentData);
  private readonly ensembleData = inject(EnsembleData);

  readonly student = input.required<StudentDetail>();
  /** Whether the user may change the seats. */
  readonly editable = input(false);
  /** A seat changed; the record should be loaded again. */
  readonly changed = output<void>();

  protected readonly instruments = instruments;
  private readonly schoolId = computed(() => this.student().schoolId);
  private readonly schoolEnsembles = this.ensembleData.ofSchool(this.schoolId);
  protected readonly ensembles = computed<Ensemble[]>(() =>
    this.schoolEnsembles.hasValue() ? this.schoolEnsembles.value().rows : [],
  );
  protected readonly seats = computed(() =>
    this.student().enrollments.filter((seat) => seat.active),
  );
  protected readonly openEnsembles = computed(() => {
    const seated = new Set(this.seats().map((seat) => seat.ensembleId));
    return this.ensembles().filter((ensemble) => !seated.has(ensemble.id));
  });
  protected readonly adding = signal(false);
  protected readonly busy = signal(false);
  protected readonly message = signal('');
  protected readonly fieldMessage = fieldMessage;

  protected readonly seatForm = inject(NonNullableFormBuilder).group({
    ensembleId: [null as number | null, schemaValidator(seatFields.ensembleId)],
    instrumentId: ['', schemaValidator(seatFields.instrumentId)],
    part: ['', schemaValidator(seatFields.part)],
    chair: [null as number | null, schemaValidator(seatFields.chair)],
  });

  protected changeInstrument(seat: StudentEnrollment, change: MatSelectChange<string>): void {
    this.patch(seat, { instrumentId: change.value }, 'Instrument changed.');
  }

  protected remove(seat: StudentEnrollment): void {
    this.patch(seat, { active: false }, `Taken out of ${seat.ensembleName}.`);
  }

  protected startAdding(): void {
    this.seatForm.reset({
      ensembleId: null,
      instrumentId: this.seats()[0]?.instrumentId ?? '',
      part: '',
      chair: null,
    });
    this.adding.set(true);
  }

  protected addSeat(): void {
    this.seatForm.markAllAsTouched();
    if (this.seatForm.invalid || this.busy()) return;
    const values = this.seatForm.getRawValue();
    const input = enrollmentInputSchema.parse({
      ...values,
      chair: values.chair || null,
      studentId: this.student().id,
    });
    this.busy.set(true);
    this.message.set('');
    this.write.send(this.enrollmentData.create(input), {
      next: (seat) => {
        this.busy.set(false);
        this.adding.set(false);
        this.message.set(`Seated in ${seat.ensembleName}.`);
        this.changed.emit();
      },
      error: (error: unknown) => {
        this.busy.set(false);
        if (!showFieldErrors(this.seatForm, error)) this.message.set(errorMessage(error));
      },
    });
  }

  private patch(
    seat: StudentEnrollment,
    change: { instrumentId?: string; active?: boolean },
    done: string,
  ): void {
    this.busy.set(true);
    this.message.set('');
    this.write.send(this.enrollmentData.update(seat.id, { ...change, version: seat.version }), {
      next: () => {
        this.busy.set(false);
        this.message.set(done);
        this.changed.emit();
      },
      error: (error: unknown) => {
        this.busy.set(false);
        this.message.set(
          isConflict(error)
            ? 'Someone else changed this seat meanwhile. The record is loaded again; check it and try once more.'
            : errorMessage(error),
        );
        if (isConflict(error)) this.changed.emit();
      },
    });
  }
}
