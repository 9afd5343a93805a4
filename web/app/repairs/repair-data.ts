import { HttpClient } from '@angular/common/http';
import { Injectable, inject } from '@angular/core';
import type { Observable } from 'rxjs';
import { repairSchema, type Repair, type RepairInput, type RepairPatch } from '@shared/api/repair';
import { parsedWith } from '../core/parse';

/** Repair tickets through `/api/repairs`. */
@Injectable({ providedIn: 'root' })
export class FleetRepairs {
  private readonly http = inject(HttpClient);

  get(id: number): Observable<Repair> {
    return this.http.get(`/api/repairs/${id}`).pipe(parsedWith(repairSchema));
  }

  /** Opens a ticket; the instrument goes into repair. */
  create(input: RepairInput): Observable<Repair> {
    return this.http.post('/api/repairs', input).pipe(parsedWith(repairSchema));
  }

  update(id: number, patch: RepairPatch): Observable<Repair> {
    return this.http.patch(`/api/repairs/${id}`, patch).pipe(parsedWith(repairSchema));
  }
}
