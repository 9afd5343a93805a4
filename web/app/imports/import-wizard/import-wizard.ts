import {
  ChangeDetectionStrategy,
  Component,
  computed,
  inject,
  linkedSignal,
  output,
  signal,
  viewChild,
} from '@angular/core';
import { MatButtonModule } from '@angular/material/button';
import { MatCheckboxModule } from '@angular/material/checkbox';
import { MatIconModule } from '@angular/material/icon';
import { MatProgressBarModule } from '@angular/material/progress-bar';
import { STEPPER_GLOBAL_OPTIONS } from '@angular/cdk/stepper';
import { MatStepper, MatStepperModule } from '@angular/material/stepper';
import type { ImportPreview, ImportResult } from '@shared/api/import';
import type { ColumnMapping } from '@shared/roster/roster-columns';
import { csvField } from '@shared/roster/roster-csv';
import { errorMessage } from '../../core/parse';
import { RowErrors } from '../../core/forms/row-errors';
import { MappingForm } from '../mapping-form/mapping-form';
import { OrgMapping } from '../org-mapping/org-mapping';
import { PlanChanges } from '../plan-changes/plan-changes';
import { PreviewGrid } from '../preview-grid/preview-grid';
import { RosterImports, type PreviewRequest } from '../roster-imports';
import { UploadDrop } from '../upload-drop/upload-drop';
import { commitActivity, importDoneSentence } from './import-words';
import { createWrite } from '../../core/state/write';

const errorsShown = 200;

/**
 * Upload → map columns (or, for a OneRoster bundle, its orgs to schools) → preview → commit, for
 * one roster file.
 */
@Component({
  selector: 'tb-import-wizard',
  imports: [
    MatButtonModule,
    MatCheckboxModule,
    MatIconModule,
    MatProgressBarModule,
    MatStepperModule,
    MappingForm,
    OrgMapping,
    PlanChanges,
    PreviewGrid,
    RowErrors,
    UploadDrop,
  ],
  templateUrl: './import-wizard.html',
  styleUrl: './import-wizard.scss',
  changeDetection: ChangeDetectionStrategy.OnPush,
  // A step shows a tick only once it is done (the last one too, once the import is in), never
  // for merely being visited.
  providers: [
    { provide: STEPPER_GLOBAL_OPTIONS, useValue: { displayDefaultIndicatorType: false } },
  ],
})
export class ImportWizard {
  private readonly write = createWrite();
  private readonly imports = inject(RosterImports);
  private readonly stepper = viewChild.required(MatStepper);

  /** Emits after a commit, so the history can be read again. */
  readonly committed = output<ImportResult>();

  protected readonly fileName = signal('');
  protected readonly progress = signal<number | null>(null);
  protected readonly preview = signal<ImportPreview | null>(null);
  protected readonly mapping = linkedSignal<ColumnMapping>(() => this.preview()?.mapping ?? {});
  protected readonly withdrawMissing = signal(false);
  protected readonly skipInvalid = signal(false);
  protected readonly busy = signal(false);
  protected readonly problem = signal('');
  protected readonly result = signal<ImportResult | null>(null);
  /** The furthest step the coordinator has gone on to: a step is done once they leave it forward. */
  protected readonly furthest = signal(0);
  protected readonly doneSentence = importDoneSentence;
  protected readonly activity = computed(() => {
    const preview = this.preview();
    return preview ? commitActivity(preview.plan) : '';
  });

  protected readonly errors = computed(() => this.preview()?.errors ?? []);
  protected readonly shownErrors = computed(() => this.errors().slice(0, errorsShown));
  protected readonly fileProblem = computed(() => {
    const preview = this.preview();
    if (!preview || preview.totalRows > 0) return '';
    return preview.errors.find((error) => error.line === 0)?.message ?? '';
  });
  /** The bundle's orgs that match no school yet: the mapping step lists them. */
  protected readonly unmappedOrgs = computed(() => this.preview()?.oneRoster?.unmappedOrgs ?? []);
  protected readonly mappingChanged = computed(
    () => JSON.stringify(this.mapping()) !== JSON.stringify(this.preview()?.mapping ?? {}),
  );
  protected readonly blockedWholly = computed(
    () =>
      (this.preview()?.plan.validRows ?? 0) === 0 ||
      this.errors().some((error) => error.line === 0),
  );
  protected readonly canCommit = computed(
    () =>
      this.preview() !== null &&
      !this.busy() &&
      this.result() === null &&
      !this.mappingChanged() &&
      !this.blockedWholly() &&
      (this.errors().length === 0 || this.skipInvalid()),
  );

  /** Whether the only thing keeping the Import button off is the unticked "skip" box. */
  protected readonly waitingForSkip = computed(
    () =>
      this.preview() !== null &&
      this.result() === null &&
      !this.busy() &&
      !this.mappingChanged() &&
      !this.blockedWholly() &&
      this.errors().length > 0 &&
      !this.skipInvalid(),
  );

  protected reached(index: number) {
    this.furthest.update((furthest) => Math.max(furthest, index));
  }

  protected upload(file: File) {
    this.fileName.set(file.name);
    this.result.set(null);
    this.request({ file, withdrawMissing: this.withdrawMissing() }, () => {
      if (!this.fileProblem()) this.stepper().next();
    });
  }

  protected checkRows() {
    const preview = this.preview();
    if (!preview) return;
    this.request(
      {
        importToken: preview.importToken,
        mapping: this.mapping(),
        withdrawMissing: this.withdrawMissing(),
      },
      () => this.stepper().next(),
    );
  }

  /** The org choices are saved: read the kept bundle again, so its rows find their schools. */
  protected orgsMapped() {
    const preview = this.preview();
    if (!preview) return;
    this.request(
      {
        importToken: preview.importToken,
        mapping: preview.mapping,
        withdrawMissing: this.withdrawMissing(),
      },
      () => {
        if (this.unmappedOrgs().length === 0) this.stepper().next();
      },
    );
  }

  protected setWithdrawMissing(value: boolean) {
    this.withdrawMissing.set(value);
    const preview = this.preview();
    if (preview)
      this.request(
        { importToken: preview.importToken, mapping: preview.mapping, withdrawMissing: value },
        () => undefined,
      );
  }

  protected commit() {
    const preview = this.preview();
    if (!preview || !this.canCommit()) return;
    this.busy.set(true);
    this.problem.set('');
    const request = this.imports.commit({
      importToken: preview.importToken,
      mapping: preview.mapping,
      withdrawMissing: this.withdrawMissing(),
      skipInvalid: this.skipInvalid(),
    });
    this.write.send(request, {
      next: (result) => {
        this.busy.set(false);
        this.result.set(result);
        this.committed.emit(result);
      },
      error: (error: unknown) => {
        this.busy.set(false);
        this.problem.set(
          errorMessage(error, 'The import could not be committed. Nothing was changed.'),
        );
      },
    });
  }

  protected startOver() {
    this.preview.set(null);
    this.result.set(null);
    this.problem.set('');
    this.skipInvalid.set(false);
    this.withdrawMissing.set(false);
    this.fileName.set('');
    this.furthest.set(0);
    this.stepper().reset();
  }

  /** The error list as a CSV file the coordinator can keep, cells neutralised against formulas. */
  protected downloadErrors() {
    const lines = [
      'line,column,message',
      ...this.errors().map((error) =>
        [String(error.line), error.column, error.message].map(csvField).join(','),
      ),
    ];
    const url = URL.createObjectURL(
      new Blob([`\uFEFF${lines.join('\r\n')}\r\n`], { type: 'text/csv' }),
    );
    const link = document.createElement('a');
    link.href = url;
    link.download = `${this.fileName().replace(/\.[^.]+$/, '') || 'roster'}-errors.csv`;
    link.click();
    URL.revokeObjectURL(url);
  }

  private request(request: PreviewRequest, then: () => void) {
    this.busy.set(true);
    this.problem.set('');
    this.progress.set(request.file ? 0 : 1);
    this.write.send(this.imports.preview(request), {
      next: (event) => {
        if (event.kind === 'progress') {
          this.progress.set(Math.min(event.share, 1));
          return;
        }
        this.preview.set(event.preview);
        this.busy.set(false);
        this.progress.set(null);
        // The stepper moves after the step's "completed" state has been rendered.
        setTimeout(then);
      },
      error: (error: unknown) => {
        this.busy.set(false);
        this.progress.set(null);
        this.problem.set(
          errorMessage(
            error,
            'The file could not be uploaded. Check the connection and try again.',
          ),
        );
      },
    });
  }
}
