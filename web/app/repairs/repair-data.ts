import { Injectable } from '@angular/core';
import { RecordWrites } from '../core/state/record-data';
import type { Observable } from 'rxjs';
import { repairSchema, type Repair, type RepairInput, type RepairPatch } from '@shared/api/repair';

/** Repair tickets through `/api/repairs`; creating one puts the instrument into repair. */
@Injectable({ providedIn: 'root' })
export class FleetRepairs extends RecordWrites<Repair, RepairInput, RepairPatch> {
  constructor() {
    super('/api/repairs', repairSchema);
  }

  get(id: number): Observable<Repair> {
    return this.read(`/api/repairs/${id}`, repairSchema);
  }
}
