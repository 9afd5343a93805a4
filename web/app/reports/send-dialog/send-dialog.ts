import { ChangeDetectionStrategy, Component, computed, inject, signal } from '@angular/core';
import { FormsModule } from '@angular/forms';
import { MAT_DIALOG_DATA, MatDialogModule, MatDialogRef } from '@angular/material/dialog';
import { MatButtonModule } from '@angular/material/button';
import { MatRadioModule } from '@angular/material/radio';
import { MatFormFieldModule } from '@angular/material/form-field';
import { MatInputModule } from '@angular/material/input';
import type { ReportKind, ReportSendInput } from '@shared/api/report';

/** What the dialog confirms: the report, and who the signed-in user is. */
export interface SendDialogData {
  kind: ReportKind;
  school: { id: number; name: string } | null;
  from: string;
  to: string;
  /** Whether the user may choose recipients (the coordinator); a director sends to themselves. */
  choosesRecipients: boolean;
  ownEmail: string;
}

type Audience = 'school' | 'all-directors' | 'addresses' | 'me';

/** Splits a typed list of addresses on commas, semicolons, spaces and new lines. */
export function addressesIn(text: string): string[] {
  return [
    ...new Set(
      text
        .split(/[\s,;]+/)
        .map((address) => address.trim())
        .filter(Boolean),
    ),
  ];
}

const addressPattern = /^[^\s@]+@[^\s@]+\.[^\s@]+$/;

/** Confirms a send and says exactly who will receive the report. */
@Component({
  selector: 'tb-send-dialog',
  imports: [
    FormsModule,
    MatDialogModule,
    MatButtonModule,
    MatRadioModule,
    MatFormFieldModule,
    MatInputModule,
  ],
  templateUrl: './send-dialog.html',
  styles: `
    .choices {
      display: flex;
      flex-direction: column;
      gap: 4px;
      margin: 8px 0 12px;
    }
    .addresses {
      width: 100%;
    }
    .what {
      margin: 0 0 8px;
    }
    .problem {
      color: var(--tb-danger);
      margin: 4px 0 0;
    }
  `,
  changeDetection: ChangeDetectionStrategy.OnPush,
})
export class SendDialog {
  protected readonly data = inject<SendDialogData>(MAT_DIALOG_DATA);
  private readonly dialogRef = inject(MatDialogRef<SendDialog, ReportSendInput>);

  protected readonly audience = signal<Audience>(
    !this.data.choosesRecipients
      ? 'me'
      : this.data.kind === 'director'
        ? 'school'
        : 'all-directors',
  );
  protected readonly addressText = signal('');
  protected readonly addresses = computed(() => addressesIn(this.addressText()));
  protected readonly badAddresses = computed(() =>
    this.addresses().filter((address) => !addressPattern.test(address)),
  );
  protected readonly ready = computed(
    () =>
      this.audience() !== 'addresses' ||
      (this.addresses().length > 0 && this.badAddresses().length === 0),
  );

  protected confirm(): void {
    if (!this.ready()) return;
    const { kind, from, to, school } = this.data;
    const input: ReportSendInput = { kind, from, to };
    const audience = this.audience();
    if (audience === 'all-directors') input.schoolIds = 'all-directors';
    else if (kind === 'director' && school) input.schoolIds = [school.id];
    if (audience === 'addresses') input.recipients = this.addresses();
    if (audience === 'me') input.recipients = [this.data.ownEmail];
    this.dialogRef.close(input);
  }
}
