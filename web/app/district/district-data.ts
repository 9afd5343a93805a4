import { Injectable } from '@angular/core';
import { ApiData } from '../core/state/api-data';
import type { Observable } from 'rxjs';
import { districtSchema, type District, type DistrictPatch } from '@shared/api/district';

/** Reads and changes the district's settings through the API. */
@Injectable({ providedIn: 'root' })
export class DistrictData extends ApiData {
  get(): Observable<District> {
    return this.read('/api/district', districtSchema);
  }

  update(patch: DistrictPatch): Observable<District> {
    return this.write('PATCH', '/api/district', patch, districtSchema);
  }
}
