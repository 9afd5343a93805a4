import { ChangeDetectionStrategy, Component, inject, signal } from '@angular/core';
import { MatButtonModule } from '@angular/material/button';
import { MatIconModule } from '@angular/material/icon';
import type { FeeSchedule } from '@shared/api/fee';
import { CurrentUser } from '../../core/auth/current-user';
import { errorMessage } from '../../core/parse';
import { centsOf, money } from '../../instruments/instrument-labels';
import { FeeLedger } from '../../fees/fee-data';
import { createWrite } from '../../core/state/write';
import { IconButton } from '../../core/icon-button/icon-button';

const families = ['brass', 'woodwind', 'strings', 'percussion'];

/**
 * The district's usage-fee schedule (`/api/fees/schedule`): a yearly fee per instrument family or
 * instrument, the rule for further loans in a year, and the waiver reasons. The coordinator edits
 * it on the District settings screen; anyone else who sees fees reads it.
 */
@Component({
  selector: 'tb-fee-schedule',
  imports: [IconButton, MatButtonModule, MatIconModule],
  templateUrl: './fee-schedule.html',
  styleUrl: './fee-schedule.scss',
  changeDetection: ChangeDetectionStrategy.OnPush,
})
export class FeeScheduleEditor {
  private readonly write = createWrite();
  private readonly fees = inject(FeeLedger);
  private readonly user = inject(CurrentUser);

  protected readonly money = money;
  protected readonly families = families;
  protected readonly isCoordinator = this.user.can('fees:manage');
  protected readonly errorMessage = errorMessage;
  protected readonly schedule = this.fees.schedule();
  protected readonly scheduleNotice = signal('');

  protected editSchedule(change: (schedule: FeeSchedule) => FeeSchedule): void {
    if (this.schedule.hasValue()) this.schedule.set(change(structuredClone(this.schedule.value())));
  }

  protected setEntryFee(index: number, text: string): void {
    const cents = centsOf(text);
    if (cents === null) return;
    this.editSchedule((schedule) => {
      schedule.entries[index]!.yearlyFeeCents = cents;
      return schedule;
    });
  }

  protected addEntry(scopeText: string, key: string, text: string): void {
    const scope = scopeText === 'instrument' ? 'instrument' : 'family';
    const cents = centsOf(text);
    if (!key.trim() || cents === null)
      return this.scheduleNotice.set('Name the family or instrument and its yearly fee.');
    this.editSchedule((schedule) => ({
      ...schedule,
      entries: [...schedule.entries, { scope, key: key.trim(), yearlyFeeCents: cents }],
    }));
  }

  protected removeEntry(index: number): void {
    this.editSchedule((schedule) => ({
      ...schedule,
      entries: schedule.entries.filter((_entry, at) => at !== index),
    }));
  }

  protected setRule(basis: string, percentText: string): void {
    const percent = Number(percentText);
    this.editSchedule((schedule) => ({
      ...schedule,
      additionalLoan:
        basis && Number.isInteger(percent) && percent >= 0 && percent <= 100
          ? { basis: basis as 'student' | 'household', percent }
          : null,
    }));
  }

  protected setReasons(text: string): void {
    this.editSchedule((schedule) => ({
      ...schedule,
      waiverReasons: text
        .split('\n')
        .map((line) => line.trim())
        .filter((line) => line.length >= 2),
    }));
  }

  protected saveSchedule(): void {
    if (!this.schedule.hasValue()) return;
    const { onlinePayments: _online, ...schedule } = this.schedule.value();
    this.write.send(this.fees.saveSchedule(schedule), {
      next: (value) => {
        this.schedule.set(value);
        this.scheduleNotice.set('Fee schedule saved. New loans are charged from it.');
      },
      error: (error: unknown) => this.scheduleNotice.set(errorMessage(error)),
    });
  }
}
