import { Injectable, inject } from '@angular/core';
import { MatIconRegistry } from '@angular/material/icon';
import { DomSanitizer } from '@angular/platform-browser';
import { iconNames, iconUrl } from './icon-names';

/** Registers the icon names with Material's registry; the SVGs come from our own origin. */
@Injectable({ providedIn: 'root' })
export class Icons {
  private readonly registry = inject(MatIconRegistry);
  private readonly sanitizer = inject(DomSanitizer);

  register(): void {
    const known = new Set<string>(iconNames);
    this.registry.addSvgIconResolver((name, namespace) =>
      // Only our own names resolve, to files the build copied from the package.
      !namespace && known.has(name)
        ? this.sanitizer.bypassSecurityTrustResourceUrl(iconUrl(name))
        : null,
    );
  }
}
