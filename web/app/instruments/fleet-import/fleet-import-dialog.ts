import { ChangeDetectionStrategy, Component, inject, signal } from '@angular/core';
import { MatButtonModule } from '@angular/material/button';
import { MatDialogModule, MatDialogRef } from '@angular/material/dialog';
import { MatIconModule } from '@angular/material/icon';
import { MatProgressBarModule } from '@angular/material/progress-bar';
import { fleetCsvColumns, type FleetImportResult } from '@shared/api/instrument';
import { errorMessage } from '../../core/parse';
import { FleetInstruments } from '../instrument-data';
import { createWrite } from '../../core/state/write';
import { RowErrors } from '../../core/forms/row-errors';

/**
 * Imports a fleet CSV in two steps: a dry run that lists every error by line and column, then a
 * commit of the whole file, which the server applies all or nothing.
 */
@Component({
  selector: 'tb-fleet-import-dialog',
  imports: [MatButtonModule, MatDialogModule, MatIconModule, MatProgressBarModule, RowErrors],
  templateUrl: './fleet-import-dialog.html',
  styleUrl: './fleet-import-dialog.scss',
  changeDetection: ChangeDetectionStrategy.OnPush,
})
export class FleetImportDialog {
  private readonly write = createWrite();
  private readonly fleet = inject(FleetInstruments);
  protected readonly dialog = inject<MatDialogRef<FleetImportDialog, boolean>>(MatDialogRef);

  protected readonly columns = fleetCsvColumns.join(',');
  protected readonly file = signal<File | null>(null);
  protected readonly busy = signal(false);
  protected readonly preview = signal<FleetImportResult | null>(null);
  protected readonly committed = signal<FleetImportResult | null>(null);
  protected readonly failure = signal('');

  protected choose(event: Event): void {
    const file = (event.target as HTMLInputElement).files?.[0] ?? null;
    this.file.set(file);
    this.preview.set(null);
    this.committed.set(null);
    this.failure.set('');
    if (file) this.run(file, true);
  }

  protected commit(): void {
    const file = this.file();
    if (file) this.run(file, false);
  }

  private run(file: File, dryRun: boolean): void {
    this.busy.set(true);
    this.failure.set('');
    this.write.send(this.fleet.importCsv(file, dryRun), {
      next: (result) => {
        this.busy.set(false);
        if (dryRun) this.preview.set(result);
        else if (result.committed) this.committed.set(result);
        else this.preview.set(result);
      },
      error: (error: unknown) => {
        this.busy.set(false);
        this.failure.set(errorMessage(error, 'The file could not be read.'));
      },
    });
  }
}
