import { Injectable } from '@angular/core';
import { RecordData } from '../core/state/record-data';
import type { Observable } from 'rxjs';
import { listResponseSchema, type ListResponse } from '@shared/api/list';
import {
  fleetImportResultSchema,
  instrumentDetailSchema,
  instrumentPhotoSchema,
  instrumentSchema,
  type FleetImportResult,
  type Instrument,
  type InstrumentDetail,
  type InstrumentInput,
  type InstrumentPatch,
  type InstrumentPhoto,
} from '@shared/api/instrument';
import { parsedWith } from '../core/parse';

const instrumentListSchema = listResponseSchema(instrumentSchema);

/** Reads and writes the district's instruments through `/api/instruments`. */
@Injectable({ providedIn: 'root' })
export class FleetInstruments extends RecordData<
  Instrument,
  InstrumentInput,
  InstrumentPatch,
  InstrumentDetail
> {
  constructor() {
    super('/api/instruments', instrumentSchema, instrumentDetailSchema);
  }

  /** A page of the fleet, for pickers: `q` searches asset tag, serial, maker and model. */
  list(query: Record<string, string | number>): Observable<ListResponse<Instrument>> {
    return this.read('/api/instruments', instrumentListSchema, query);
  }

  /** Records that an instrument back from a loan was cleaned and sanitised; it is lendable again. */
  markCleaned(id: number, note = ''): Observable<Instrument> {
    return this.write('POST', `/api/instruments/${id}/cleaned`, { note }, instrumentSchema);
  }

  /** Uploads one photo; the server checks what the bytes are. */
  addPhoto(id: number, file: File): Observable<InstrumentPhoto> {
    const form = new FormData();
    form.append('photo', file);
    return this.write('POST', `/api/instruments/${id}/photos`, form, instrumentPhotoSchema);
  }

  /** Checks a fleet CSV (`dryRun`) or commits it; a commit is all or nothing. */
  importCsv(file: File, dryRun: boolean): Observable<FleetImportResult> {
    return this.http
      .post(`/api/instruments/import?dryRun=${dryRun}`, file, {
        headers: { 'Content-Type': 'text/csv' },
      })
      .pipe(parsedWith(fleetImportResultSchema));
  }

  /** The address of the printable asset-tag labels of one school. */
  labelsUrl(schoolId: number): string {
    return `/api/instruments/labels.pdf?schoolId=${schoolId}`;
  }

  /** One instrument's label, printed after the `skip` labels already used on the sheet. */
  labelUrl(instrumentId: number, skip: number): string {
    return `/api/instruments/labels.pdf?instrumentId=${instrumentId}&skip=${skip}`;
  }
}
