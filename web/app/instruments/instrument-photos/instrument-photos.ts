import { ChangeDetectionStrategy, Component, inject, input, output, signal } from '@angular/core';
import { MatButtonModule } from '@angular/material/button';
import { MatIconModule } from '@angular/material/icon';
import type { InstrumentPhoto } from '@shared/api/instrument';
import { errorMessage } from '../../core/parse';
import { FleetInstruments } from '../instrument-data';
import { dayText } from '../instrument-labels';
import { createWrite } from '../../core/state/write';

/** The largest photo the server takes, in bytes (it checks again, and checks the content). */
const largestPhoto = 5 * 1024 * 1024;
const photoTypes = ['image/jpeg', 'image/png', 'image/webp'];

/** An instrument's photos, and an upload for those who keep the fleet. */
@Component({
  selector: 'tb-instrument-photos',
  imports: [MatButtonModule, MatIconModule],
  template: `
    <h2>Photos</h2>
    @if (photos().length === 0) {
      <p class="tb-muted">No photos yet.</p>
    } @else {
      <ul class="photos">
        @for (photo of photos(); track photo.id) {
          <li>
            <a [href]="photo.url" target="_blank" rel="noopener">
              <img
                [src]="photo.url"
                [alt]="'Photo of ' + assetTag() + ' taken ' + day(photo.createdAt)"
                loading="lazy"
              />
            </a>
          </li>
        }
      </ul>
    }
    @if (editable()) {
      <label class="upload">
        <span class="button-like"
          ><mat-icon svgIcon="add_a_photo" aria-hidden="true" />Add a photo</span
        >
        <input
          class="tb-visually-hidden"
          type="file"
          accept="image/jpeg,image/png,image/webp"
          (change)="upload($event)"
          data-testid="photo-file"
        />
      </label>
      <p class="tb-muted small">
        JPEG, PNG or WebP, at most 5 MB. The server checks that the file really is an image.
      </p>
      @if (status()) {
        <p [class.failed]="failed()" role="status">{{ status() }}</p>
      }
    }
  `,
  styles: `
    h2 {
      margin: 0 0 12px;
      font-size: 1.05rem;
      font-weight: 600;
    }
    .photos {
      list-style: none;
      margin: 0 0 12px;
      padding: 0;
      display: flex;
      flex-wrap: wrap;
      gap: 8px;
    }
    img {
      width: 120px;
      height: 90px;
      object-fit: cover;
      border-radius: 8px;
      border: 1px solid var(--tb-line);
      display: block;
    }
    .upload {
      display: inline-block;
      cursor: pointer;
    }
    .button-like {
      display: inline-flex;
      align-items: center;
      gap: 6px;
      padding: 6px 14px;
      border: 1px solid var(--tb-line);
      border-radius: 999px;
      color: var(--tb-teal-deep);
      font-weight: 500;
      mat-icon {
        width: 18px;
        height: 18px;
        fill: currentColor;
      }
    }
    .upload:focus-within .button-like {
      outline: 3px solid #c2820f;
      outline-offset: 2px;
    }
    .small {
      font-size: 0.85rem;
      margin: 6px 0 0;
    }
    .failed {
      color: var(--tb-danger);
    }
  `,
  changeDetection: ChangeDetectionStrategy.OnPush,
})
export class InstrumentPhotos {
  private readonly write = createWrite();
  private readonly fleet = inject(FleetInstruments);

  readonly instrumentId = input.required<number>();
  readonly assetTag = input('');
  readonly photos = input<InstrumentPhoto[]>([]);
  readonly editable = input(false);
  /** A photo was added. */
  readonly added = output<InstrumentPhoto>();

  protected readonly status = signal('');
  protected readonly failed = signal(false);
  protected readonly day = dayText;

  protected upload(event: Event): void {
    const input = event.target as HTMLInputElement;
    const file = input.files?.[0];
    input.value = '';
    if (!file) return;
    if (!photoTypes.includes(file.type))
      return this.report('Choose a JPEG, PNG or WebP image.', true);
    if (file.size > largestPhoto) return this.report('That photo is larger than 5 MB.', true);
    this.report('Uploading…', false);
    this.write.send(this.fleet.addPhoto(this.instrumentId(), file), {
      next: (photo) => {
        this.report('Photo added.', false);
        this.added.emit(photo);
      },
      error: (error: unknown) => this.report(errorMessage(error, 'The photo was refused.'), true),
    });
  }

  private report(message: string, failed: boolean): void {
    this.status.set(message);
    this.failed.set(failed);
  }
}
