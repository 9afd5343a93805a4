import { ChangeDetectionStrategy, Component, effect, inject, signal } from '@angular/core';
import { FormControl } from '@angular/forms';
import { MatButtonModule } from '@angular/material/button';
import { MatIconModule } from '@angular/material/icon';
import { agreementTextInputSchema } from '@shared/api/loan';
import { Field } from '../../core/forms/field';
import { schemaValidator } from '../../core/forms/record-form';
import { errorMessage } from '../../core/parse';
import { dayText } from '../../instruments/instrument-labels';
import { FleetLoans } from '../../loans/loan-data';
import { createWrite } from '../../core/state/write';

/**
 * The loan agreement text guardians sign (`/api/loans/agreement-text`). Every save is a new
 * version; a loan already signed keeps the text and version it was signed with.
 */
@Component({
  selector: 'tb-agreement-text',
  imports: [MatButtonModule, MatIconModule, Field],
  templateUrl: './agreement-text.html',
  styleUrl: './agreement-text.scss',
  changeDetection: ChangeDetectionStrategy.OnPush,
})
export class AgreementTextEditor {
  private readonly write = createWrite();
  private readonly loans = inject(FleetLoans);

  protected readonly day = dayText;
  protected readonly errorMessage = errorMessage;
  protected readonly current = this.loans.agreementText();
  protected readonly saving = this.write.saving;
  protected readonly notice = signal('');
  protected readonly failure = signal('');
  protected readonly text = new FormControl('', {
    nonNullable: true,
    validators: schemaValidator(agreementTextInputSchema.shape.text),
  });

  constructor() {
    // The form follows the text in force: as loaded, and as saved.
    effect(() => {
      if (this.current.hasValue()) this.text.reset(this.current.value().text);
    });
  }

  protected save(): void {
    this.text.markAsTouched();
    this.notice.set('');
    this.failure.set('');
    if (this.text.invalid || this.saving()) return;
    this.write.send(this.loans.saveAgreementText(this.text.value), {
      next: (value) => {
        this.current.set(value);
        this.notice.set(`Saved as version ${value.version}. New agreements use it.`);
      },
      error: (error: unknown) => {
        this.failure.set(errorMessage(error, 'The agreement text could not be saved.'));
      },
    });
  }
}
