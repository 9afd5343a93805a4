import { HttpClient } from '@angular/common/http';
import { Injectable, inject, signal } from '@angular/core';
import { firstValueFrom } from 'rxjs';
import type { District } from '@shared/api/district';

/** The district the app runs for (name, logo, time zone), loaded once and shared by every page. */
@Injectable({ providedIn: 'root' })
export class CurrentDistrict {
  private readonly http = inject(HttpClient);
  private readonly state = signal<District | null>(null);
  private loading: Promise<District | null> | null = null;

  /** The district, or null until it has loaded. */
  readonly district = this.state.asReadonly();

  /** Loads the district once; null when it cannot be read (signed out). */
  load(): Promise<District | null> {
    // The schema is imported lazily so zod stays out of the initial bundle.
    this.loading ??= Promise.all([
      firstValueFrom(this.http.get('/api/district')),
      import('@shared/api/district'),
    ])
      .then(([body, { districtSchema }]) => {
        const district = districtSchema.parse(body);
        this.state.set(district);
        return district;
      })
      .catch(() => {
        this.loading = null;
        return null;
      });
    return this.loading;
  }

  /** Shows a district the settings screen just saved. */
  update(district: District): void {
    this.state.set(district);
    this.loading = Promise.resolve(district);
  }
}
