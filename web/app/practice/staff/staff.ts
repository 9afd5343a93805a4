import {
  ChangeDetectionStrategy,
  Component,
  ElementRef,
  effect,
  input,
  signal,
  viewChild,
} from '@angular/core';
import type { StaffMusic } from '../sheet';
import { renderStaff } from './render-staff';

/** One pattern drawn as a staff of music (VexFlow SVG) that scales to the width of its box. */
@Component({
  selector: 'tb-staff',
  template: `
    <div
      #canvas
      class="canvas"
      role="img"
      [attr.aria-label]="label()"
      [attr.data-notes]="drawnNotes()"
    ></div>
    @if (failed()) {
      <p class="failed">The staff could not be drawn. Reload the page to try again.</p>
    }
  `,
  styles: `
    :host {
      display: block;
    }
    .canvas :is(svg) {
      display: block;
      width: 100%;
      height: auto;
    }
    .failed {
      color: var(--tb-danger);
    }
  `,
  changeDetection: ChangeDetectionStrategy.OnPush,
})
export class Staff {
  /** The notes, clef, key signature and tempo to draw. */
  readonly music = input.required<StaffMusic>();
  /** Whether to set the notes closer, for the band set and the practice plan. */
  readonly compact = input(false);
  /** What a screen reader announces for the staff. */
  readonly label = input.required<string>();

  private readonly canvas = viewChild.required<ElementRef<HTMLDivElement>>('canvas');
  /** Notes and rests drawn, once the staff is on the page (browser tests wait for it). */
  protected readonly drawnNotes = signal<number | null>(null);
  protected readonly failed = signal(false);
  private drawing = 0;

  constructor() {
    effect(() => {
      const music = this.music();
      const compact = this.compact();
      const host = this.canvas().nativeElement;
      const turn = ++this.drawing;
      this.drawnNotes.set(null);
      renderStaff(host, music, { compact })
        .then((count) => {
          if (turn === this.drawing) this.drawnNotes.set(count);
        })
        .catch((error: unknown) => {
          console.error(error);
          if (turn === this.drawing) this.failed.set(true);
        });
    });
  }
}
