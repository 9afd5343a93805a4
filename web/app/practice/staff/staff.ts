import {
  ChangeDetectionStrategy,
  Component,
  DestroyRef,
  ElementRef,
  effect,
  inject,
  input,
  signal,
  viewChild,
} from '@angular/core';
import type { StaffMusic } from '../sheet';
import { renderStaff } from './render-staff';
import { drawingWidth, staffWidth } from './staff-layout';

/**
 * One pattern drawn as a staff of music (VexFlow SVG) that scales to the width of its box. A
 * full-size staff in a box narrower than the widest staff (a phone) is drawn at the box's own
 * width, wrapped onto more lines, so the notes keep their size.
 */
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
  /** The width the staff is drawn at, from the box's width. */
  private readonly width = signal(0);

  constructor() {
    const host = inject<ElementRef<HTMLElement>>(ElementRef).nativeElement;
    if (typeof ResizeObserver !== 'undefined') {
      const observer = new ResizeObserver(([entry]) => {
        // Printing lays the page out again at the paper's width: the staff keeps the lines it
        // has on screen rather than being drawn again while the page is being printed.
        if (entry && !matchMedia('print').matches)
          this.width.set(drawingWidth(entry.contentRect.width));
      });
      observer.observe(host);
      inject(DestroyRef).onDestroy(() => observer.disconnect());
    } else {
      this.width.set(drawingWidth(0));
    }
    effect(() => {
      const music = this.music();
      const compact = this.compact();
      // The band set and the practice plan set many small staves side by side for print, where
      // the widest drawing scaled down keeps each one line; a sheet's own staff wraps instead.
      const width = compact ? staffWidth : this.width();
      const host = this.canvas().nativeElement;
      if (width === 0) return;
      const turn = ++this.drawing;
      this.drawnNotes.set(null);
      renderStaff(host, music, { compact, width })
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
