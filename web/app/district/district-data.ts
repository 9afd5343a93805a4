import { HttpClient } from '@angular/common/http';
import { Injectable, inject } from '@angular/core';
import type { Observable } from 'rxjs';
import { districtSchema, type District, type DistrictPatch } from '@shared/api/district';
import { parsedWith } from '../core/parse';

/** Reads and changes the district's settings through the API. */
@Injectable({ providedIn: 'root' })
export class DistrictData {
  private readonly http = inject(HttpClient);

  get(): Observable<District> {
    return this.http.get('/api/district').pipe(parsedWith(districtSchema));
  }

  update(patch: DistrictPatch): Observable<District> {
    return this.http.patch('/api/district', patch).pipe(parsedWith(districtSchema));
  }
}
