import { ChangeDetectionStrategy, Component, input, output, signal } from '@angular/core';
import { MatIconModule } from '@angular/material/icon';
import { MatProgressBarModule } from '@angular/material/progress-bar';
import { largestRosterUpload } from '@shared/api/import';

/** Where a roster file is dropped or picked, with the upload's progress. */
@Component({
  selector: 'tb-upload-drop',
  imports: [MatIconModule, MatProgressBarModule],
  template: `
    <label
      class="drop"
      [class.over]="over()"
      (dragover)="$event.preventDefault(); over.set(true)"
      (dragleave)="over.set(false)"
      (drop)="dropped($event)"
    >
      <mat-icon svgIcon="upload_file" aria-hidden="true" />
      <span class="lead">Drop the roster here, or <u>choose a file</u></span>
      <span class="tb-muted">
        A CSV export from the student information system, or a OneRoster 1.1 bundle (.zip). At most
        {{ megabytes }} MB.
      </span>
      <input
        type="file"
        class="tb-visually-hidden"
        accept=".csv,.tsv,.txt,.zip,text/csv,application/zip"
        data-testid="roster-file"
        [disabled]="busy()"
        (change)="picked($event)"
      />
    </label>
    @if (progress() !== null) {
      <div class="progress">
        <mat-progress-bar
          [mode]="progress()! < 1 ? 'determinate' : 'indeterminate'"
          [value]="progress()! * 100"
          aria-label="Upload progress"
        />
        <span class="tb-muted">{{
          progress()! < 1 ? 'Uploading ' + fileName() + '…' : 'Reading and checking every row…'
        }}</span>
      </div>
    }
    @if (tooLarge()) {
      <p class="problem" role="alert">{{ tooLarge() }}</p>
    }
  `,
  styles: `
    .drop {
      display: flex;
      flex-direction: column;
      align-items: center;
      gap: 6px;
      padding: 40px 24px;
      border: 2px dashed var(--tb-line);
      border-radius: var(--tb-radius);
      background: var(--tb-surface);
      cursor: pointer;
      text-align: center;
    }
    .drop.over,
    .drop:focus-within {
      border-color: var(--tb-teal);
      background: #eef7f7;
    }
    mat-icon {
      width: 40px;
      height: 40px;
      fill: var(--tb-teal);
    }
    .lead {
      font-weight: 600;
      font-size: 1.05rem;
    }
    .progress {
      margin-top: 16px;
      display: grid;
      gap: 6px;
    }
    .problem {
      color: var(--tb-danger);
      margin: 12px 0 0;
    }
  `,
  changeDetection: ChangeDetectionStrategy.OnPush,
})
export class UploadDrop {
  readonly progress = input<number | null>(null);
  readonly fileName = input('');
  readonly busy = input(false);
  readonly file = output<File>();

  protected readonly over = signal(false);
  protected readonly tooLarge = signal('');
  protected readonly megabytes = largestRosterUpload / (1024 * 1024);

  protected picked(event: Event) {
    const target = event.target as HTMLInputElement;
    const file = target.files?.[0];
    target.value = '';
    if (file) this.take(file);
  }

  protected dropped(event: DragEvent) {
    event.preventDefault();
    this.over.set(false);
    const file = event.dataTransfer?.files[0];
    if (file && !this.busy()) this.take(file);
  }

  private take(file: File) {
    if (file.size > largestRosterUpload) {
      this.tooLarge.set(
        `${file.name} is ${(file.size / (1024 * 1024)).toFixed(1)} MB; a roster upload can be at most ${this.megabytes} MB. Export one school at a time, or leave out columns the roster does not use.`,
      );
      return;
    }
    this.tooLarge.set('');
    this.file.emit(file);
  }
}
