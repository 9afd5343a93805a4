import { Injectable } from '@angular/core';
import { ApiData } from '../core/state/api-data';
import type { Observable } from 'rxjs';
import { repairSchema, type Repair, type RepairInput, type RepairPatch } from '@shared/api/repair';

/** Repair tickets through `/api/repairs`. */
@Injectable({ providedIn: 'root' })
export class FleetRepairs extends ApiData {
  get(id: number): Observable<Repair> {
    return this.read(`/api/repairs/${id}`, repairSchema);
  }

  /** Opens a ticket; the instrument goes into repair. */
  create(input: RepairInput): Observable<Repair> {
    return this.write('POST', '/api/repairs', input, repairSchema);
  }

  update(id: number, patch: RepairPatch): Observable<Repair> {
    return this.write('PATCH', `/api/repairs/${id}`, patch, repairSchema);
  }
}
