import { Injectable, inject } from '@angular/core';
import { MatIconRegistry } from '@angular/material/icon';
import { DomSanitizer } from '@angular/platform-browser';
import { iconNames, iconUrl } from './icon-names';

/**
 * Registers the icon names with Material's registry; the SVGs come from our own origin. Called by
 * the lazily loaded screens that draw icons (the shell, the connection notices), so Material's
 * icon code stays out of the first bundle; a second call does nothing.
 */
@Injectable({ providedIn: 'root' })
export class Icons {
  private readonly registry = inject(MatIconRegistry);
  private readonly sanitizer = inject(DomSanitizer);

  private registered = false;

  register(): void {
    if (this.registered) return;
    this.registered = true;
    const known = new Set<string>(iconNames);
    this.registry.addSvgIconResolver((name, namespace) =>
      // Only our own names resolve, to files the build copied from the package.
      !namespace && known.has(name)
        ? this.sanitizer.bypassSecurityTrustResourceUrl(iconUrl(name))
        : null,
    );
  }
}
