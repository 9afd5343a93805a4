import { ChangeDetectionStrategy, Component, input, output } from '@angular/core';
import { ChartCard } from '../chart-card/chart-card';
import type { ChartFigure, DrillTarget } from '../chart-figure';

/** One chart card of a grid: its figure and the words around it. */
export interface ChartCardSpec {
  /** The card's `data-testid`, which also keeps its place when the figures change. */
  testId: string;
  heading: string;
  description: string;
  figure: ChartFigure;
  /** The chart's height in pixels (the card's default when left out). */
  height?: number;
  /** Whether the card spans both columns. */
  wide?: boolean;
}

/**
 * Chart cards two to a row (one on narrow windows), a wide card taking a whole row; selecting a
 * bar in any of them emits the rows behind it.
 */
@Component({
  selector: 'tb-chart-grid',
  imports: [ChartCard],
  template: `
    @for (card of cards(); track card.testId) {
      <tb-chart-card
        [class.wide]="card.wide"
        [attr.data-testid]="card.testId"
        [heading]="card.heading"
        [description]="card.description"
        [figure]="card.figure"
        [height]="card.height ?? 300"
        (drill)="drill.emit($event)"
      />
    }
  `,
  styleUrl: './chart-grid.scss',
  changeDetection: ChangeDetectionStrategy.OnPush,
})
export class ChartGrid {
  readonly cards = input.required<ChartCardSpec[]>();
  /** Emits the rows behind the bar, point or cell the user chose. */
  readonly drill = output<DrillTarget>();
}
