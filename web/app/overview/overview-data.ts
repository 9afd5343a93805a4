import { HttpClient, HttpParams } from '@angular/common/http';
import { Injectable, inject } from '@angular/core';
import { type Observable, catchError, forkJoin, map, of } from 'rxjs';
import * as z from 'zod';
import {
  attainmentRowSchema,
  auditionReadyRowSchema,
  overviewSchema,
  type AttainmentRow,
  type AuditionReadyRow,
  type Overview,
} from '@shared/api/analytics';
import { ladderSchema, type Ladder } from '@shared/api/ladder';
import { listResponseSchema, type ListResponse } from '@shared/api/list';
import { passOffSchema, type PassOff } from '@shared/api/pass-off';
import { instrumentSchema, type Instrument } from '@shared/api/instrument';
import { loanSchema, type Loan } from '@shared/api/loan';
import {
  retentionStudentSchema,
  yearOverYearSchema,
  type RetentionStudent,
  type YearOverYear,
} from '@shared/api/year-over-year';
import { parsedWith } from '../core/parse';

/** The Overview's filters: one school and one grade, or the whole scope. */
export interface OverviewFilters {
  schoolId?: number;
  grade?: number;
}

/** One fleet figure: the count, or null when the list could not be read. */
export type FleetCount = number | null;

/** Instruments out on loan, loans overdue, and instruments in repair. */
export interface FleetFigures {
  out: FleetCount;
  overdue: FleetCount;
  inRepair: FleetCount;
}

type Query = Record<string, string | number | boolean>;

const params = (query: Query) =>
  new HttpParams({
    fromObject: Object.fromEntries(
      Object.entries(query).map(([name, value]) => [name, String(value)]),
    ),
  });

const listTotalSchema = z.object({ total: z.number().int() });

const schemas = {
  '/api/analytics/students': listResponseSchema(attainmentRowSchema),
  '/api/pass-offs': listResponseSchema(passOffSchema),
  '/api/instruments': listResponseSchema(instrumentSchema),
  '/api/loans': listResponseSchema(loanSchema),
  '/api/analytics/retention/students': listResponseSchema(retentionStudentSchema),
};

/** The list routes a figure's rows come from. */
export type DrillPath = keyof typeof schemas;

/** The rows a drill-down list shows, by the route they come from. */
export type DrillRows =
  | { path: '/api/analytics/students'; list: ListResponse<AttainmentRow> }
  | { path: '/api/pass-offs'; list: ListResponse<PassOff> }
  | { path: '/api/instruments'; list: ListResponse<Instrument> }
  | { path: '/api/loans'; list: ListResponse<Loan> }
  | { path: '/api/analytics/retention/students'; list: ListResponse<RetentionStudent> };

/** Reads the Overview's figures and the rows behind them. */
@Injectable({ providedIn: 'root' })
export class OverviewData {
  private readonly http = inject(HttpClient);

  overview(filters: OverviewFilters): Observable<Overview> {
    return this.http
      .get('/api/analytics/overview', { params: params({ ...filters }) })
      .pipe(parsedWith(overviewSchema));
  }

  /** Retention from the year before and the cohorts' climb, for a year (default the current). */
  yearOverYear(filters: { schoolYearId?: number; schoolId?: number }): Observable<YearOverYear> {
    return this.http
      .get('/api/analytics/year-over-year', { params: params({ ...filters }) })
      .pipe(parsedWith(yearOverYearSchema));
  }

  /** Whether a path is one of the lists the Overview drills into. */
  isDrillPath(path: string): path is DrillPath {
    return path in schemas;
  }

  /** One page of the rows behind a figure. */
  rows(path: DrillPath, query: Query, offset: number, limit: number): Observable<DrillRows> {
    return this.http
      .get(path, { params: params({ ...query, offset, limit }) })
      .pipe(map((body) => ({ path, list: schemas[path].parse(body) }) as DrillRows));
  }

  auditionReady(
    requirementCodes: string[],
    minTempo: number | null,
    filters: OverviewFilters,
  ): Observable<ListResponse<AuditionReadyRow>> {
    const query: Query = {
      requirementCodes: requirementCodes.join(','),
      limit: 200,
      sort: 'lastName:asc',
      ...filters,
    };
    if (minTempo !== null) query['minTempo'] = minTempo;
    return this.http
      .get('/api/analytics/audition-ready', { params: params(query) })
      .pipe(parsedWith(listResponseSchema(auditionReadyRowSchema)));
  }

  ladder(): Observable<Ladder> {
    return this.http.get('/api/ladder').pipe(parsedWith(ladderSchema));
  }

  /** The fleet's three figures; each one that fails reads as null rather than failing the page. */
  fleet(filters: OverviewFilters): Observable<FleetFigures> {
    const count = (path: string, query: Query): Observable<FleetCount> =>
      this.http.get(path, { params: params({ ...query, limit: 1 }) }).pipe(
        map((body) => listTotalSchema.parse(body).total),
        catchError(() => of(null)),
      );
    const instrumentsAt: Query =
      filters.schoolId === undefined ? {} : { homeSchoolId: filters.schoolId };
    const loansAt: Query = filters.schoolId === undefined ? {} : { schoolId: filters.schoolId };
    return forkJoin({
      out: count('/api/instruments', { status: 'on-loan', ...instrumentsAt }),
      overdue: count('/api/loans', { overdue: 'true', ...loansAt }),
      inRepair: count('/api/instruments', { status: 'in-repair', ...instrumentsAt }),
    });
  }
}
