import { ChangeDetectionStrategy, Component, inject, signal } from '@angular/core';
import { FormControl, ReactiveFormsModule } from '@angular/forms';
import { MatButtonModule } from '@angular/material/button';
import { MatFormFieldModule } from '@angular/material/form-field';
import { MatIconModule } from '@angular/material/icon';
import { MatInputModule } from '@angular/material/input';
import { agreementTextInputSchema, type AgreementText } from '../../../../shared/api/loan';
import { fieldMessage, schemaValidator } from '../../core/forms/record-form';
import { errorMessage } from '../../core/parse';
import { dayText } from '../../instruments/instrument-labels';
import { FleetLoans } from '../../loans/loan-data';

type Load<Value> =
  { kind: 'loading' } | { kind: 'error'; message: string } | { kind: 'ready'; value: Value };

/**
 * The loan agreement text guardians sign (`/api/loans/agreement-text`). Every save is a new
 * version; a loan already signed keeps the text and version it was signed with.
 */
@Component({
  selector: 'tb-agreement-text',
  imports: [
    ReactiveFormsModule,
    MatButtonModule,
    MatFormFieldModule,
    MatIconModule,
    MatInputModule,
  ],
  templateUrl: './agreement-text.html',
  styleUrl: './agreement-text.scss',
  changeDetection: ChangeDetectionStrategy.OnPush,
})
export class AgreementTextEditor {
  private readonly loans = inject(FleetLoans);

  protected readonly day = dayText;
  protected readonly fieldMessage = fieldMessage;
  protected readonly current = signal<Load<AgreementText>>({ kind: 'loading' });
  protected readonly saving = signal(false);
  protected readonly notice = signal('');
  protected readonly failure = signal('');
  protected readonly text = new FormControl('', {
    nonNullable: true,
    validators: schemaValidator(agreementTextInputSchema.shape.text),
  });

  constructor() {
    this.loans.agreementText().subscribe({
      next: (value) => this.show(value),
      error: (error: unknown) => this.current.set({ kind: 'error', message: errorMessage(error) }),
    });
  }

  private show(value: AgreementText): void {
    this.current.set({ kind: 'ready', value });
    this.text.reset(value.text);
  }

  protected save(): void {
    this.text.markAsTouched();
    this.notice.set('');
    this.failure.set('');
    if (this.text.invalid || this.saving()) return;
    this.saving.set(true);
    this.loans.saveAgreementText(this.text.value).subscribe({
      next: (value) => {
        this.saving.set(false);
        this.show(value);
        this.notice.set(`Saved as version ${value.version}. New agreements use it.`);
      },
      error: (error: unknown) => {
        this.saving.set(false);
        this.failure.set(errorMessage(error, 'The agreement text could not be saved.'));
      },
    });
  }
}
