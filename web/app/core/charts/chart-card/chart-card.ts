import { ChangeDetectionStrategy, Component, input, output, signal } from '@angular/core';
import { MatButtonModule } from '@angular/material/button';
import { MatIconModule } from '@angular/material/icon';
import { NgxEchartsDirective } from 'ngx-echarts';
import type { ChartFigure, DrillTarget } from '../chart-figure';

let nextId = 0;

/** The part of an ECharts click event the card reads. */
interface ChartClick {
  seriesIndex?: number;
  dataIndex?: number;
}

/**
 * A chart in a card, with a "Show as table" switch that shows the same figures as an accessible
 * table. Selecting a bar (or a table cell) emits the rows behind it.
 */
@Component({
  selector: 'tb-chart-card',
  imports: [NgxEchartsDirective, MatButtonModule, MatIconModule],
  templateUrl: './chart-card.html',
  styleUrl: './chart-card.scss',
  changeDetection: ChangeDetectionStrategy.OnPush,
})
export class ChartCard {
  readonly heading = input.required<string>();
  readonly description = input('');
  readonly figure = input.required<ChartFigure>();
  /** The chart's height in pixels. */
  readonly height = input(300);
  /** Emits the rows behind the bar, point or cell the user chose. */
  readonly drill = output<DrillTarget>();

  protected readonly headingId = `tb-chart-${nextId++}`;
  /** Whether the figures show as a table instead of the chart. */
  protected readonly asTable = signal(false);
  protected readonly initOptions = { renderer: 'svg' as const };

  protected toggle(): void {
    this.asTable.update((value) => !value);
  }

  protected chartClicked(event: ChartClick): void {
    if (event.seriesIndex === undefined || event.dataIndex === undefined) return;
    const target = this.figure().targetAt(event.seriesIndex, event.dataIndex);
    if (target) this.drill.emit(target);
  }
}
