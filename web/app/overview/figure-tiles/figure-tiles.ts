import { ChangeDetectionStrategy, Component, input, output } from '@angular/core';
import { NgTemplateOutlet } from '@angular/common';
import { MatIconModule } from '@angular/material/icon';
import type { Overview } from '@shared/api/analytics';
import type { DrillTarget } from '../../core/charts/chart-figure';
import type { FleetFigures, OverviewFilters } from '../overview-data';
import { overallShare } from '../overview-charts/benchmark-share';
import { percentText, shortDate } from '../overview-charts/figure-words';

/** One headline figure: its value, what it counts, and the rows behind it when it has any. */
export interface FigureTile {
  id: string;
  label: string;
  value: string;
  detail: string;
  icon: string;
  target: DrillTarget | null;
  /** Whether the figure could not be read (the tile says so instead of a number). */
  unavailable?: boolean;
  tone?: 'warn';
}

/** The Monday (ISO 8601 weeks start on Monday) of the week an ISO date falls in. */
export function weekStartOf(isoDate: string): string {
  const date = new Date(`${isoDate}T00:00:00Z`);
  date.setUTCDate(date.getUTCDate() - ((date.getUTCDay() + 6) % 7));
  return date.toISOString().slice(0, 10);
}

/** The ladder tiles of the Overview, from its figures. */
export function ladderTiles(overview: Overview, filters: OverviewFilters): FigureTile[] {
  const scope = { ...filters };
  const bars = overview.benchmark.byGrade;
  const share = overallShare(bars);
  const atOrAbove = bars.reduce((sum, bar) => sum + bar.atOrAbove, 0);
  const counted = bars.reduce((sum, bar) => sum + bar.students, 0);
  const monday = weekStartOf(overview.asOf);
  const week = overview.passOffsPerWeek.find((entry) => entry.weekStart === monday);
  return [
    {
      id: 'students',
      label: 'Active students',
      value: overview.studentCount.toLocaleString('en-US'),
      detail: 'on the music roster',
      icon: 'groups',
      target: { title: 'Every active student', path: '/api/analytics/students', query: scope },
    },
    {
      id: 'benchmark',
      label: 'At or above benchmark',
      value: percentText(share),
      detail: `${atOrAbove.toLocaleString('en-US')} of ${counted.toLocaleString('en-US')} · ${(counted - atOrAbove).toLocaleString('en-US')} below`,
      icon: 'stairs',
      target: {
        title: 'Below the benchmark for their grade',
        path: '/api/analytics/students',
        query: { ...scope, belowBenchmark: true },
      },
    },
    {
      id: 'pass-offs',
      label: 'Pass-offs this week',
      value: String(week?.heard ?? 0),
      detail: `${week?.passed ?? 0} passed · week of ${shortDate(monday)}`,
      icon: 'fact_check',
      target: week
        ? {
            title: `Pass-offs in the week of ${shortDate(monday)}`,
            path: week.drill.path,
            query: week.drill.query,
          }
        : null,
    },
    {
      id: 'stalled',
      label: 'Stalled students',
      value: overview.stalled.students.toLocaleString('en-US'),
      detail: `no pass-off in ${overview.stalled.days} days`,
      icon: 'hourglass_empty',
      tone: overview.stalled.students > 0 ? 'warn' : undefined,
      target: {
        title: `No pass-off in ${overview.stalled.days} days`,
        path: overview.stalled.drill.path,
        query: overview.stalled.drill.query,
      },
    },
  ];
}

/** The fleet tiles; a figure the server could not give reads "Not available". */
export function fleetTiles(fleet: FleetFigures, filters: OverviewFilters): FigureTile[] {
  const instrumentsAt: DrillTarget['query'] =
    filters.schoolId === undefined ? {} : { homeSchoolId: filters.schoolId };
  const loansAt: DrillTarget['query'] =
    filters.schoolId === undefined ? {} : { schoolId: filters.schoolId };
  const tile = (
    id: string,
    label: string,
    count: number | null,
    detail: string,
    icon: string,
    target: DrillTarget,
  ): FigureTile =>
    count === null
      ? {
          id,
          label,
          value: '—',
          detail: 'Not available right now',
          icon,
          target: null,
          unavailable: true,
        }
      : {
          id,
          label,
          value: count.toLocaleString('en-US'),
          detail,
          icon,
          target,
          tone: id === 'overdue' && count > 0 ? 'warn' : undefined,
        };
  return [
    tile('out', 'Instruments out', fleet.out, 'on loan to students', 'handshake', {
      title: 'Instruments on loan',
      path: '/api/instruments',
      query: { status: 'on-loan', ...instrumentsAt },
    }),
    tile('overdue', 'Loans overdue', fleet.overdue, 'past their due date', 'warning', {
      title: 'Loans past their due date',
      path: '/api/loans',
      query: { overdue: 'true', ...loansAt },
    }),
    tile('in-repair', 'In repair', fleet.inRepair, 'with a ticket open', 'build', {
      title: 'Instruments in repair',
      path: '/api/instruments',
      query: { status: 'in-repair', ...instrumentsAt },
    }),
  ];
}

/** The headline figures as a row of tiles; each tile with rows behind it is a button. */
@Component({
  selector: 'tb-figure-tiles',
  imports: [MatIconModule, NgTemplateOutlet],
  templateUrl: './figure-tiles.html',
  styleUrl: './figure-tiles.scss',
  changeDetection: ChangeDetectionStrategy.OnPush,
})
export class FigureTiles {
  readonly tiles = input.required<FigureTile[]>();
  readonly drill = output<DrillTarget>();
}
