import { Injectable, inject } from '@angular/core';
import { MatIconRegistry } from '@angular/material/icon';
import { DomSanitizer } from '@angular/platform-browser';
import { iconNames, iconUrl } from './icon-names';
import { inlineIcons } from './inline-icons';

/**
 * Registers the icon names with Material's registry: the shell's and the pass-off entry's from the
 * code itself, the others as files from our own origin. Called by
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
    for (const [name, svg] of Object.entries(inlineIcons)) {
      // Our own copies of the package's files, bundled at build time.
      this.registry.addSvgIconLiteral(name, this.sanitizer.bypassSecurityTrustHtml(svg));
    }
    const known = new Set<string>(iconNames);
    this.registry.addSvgIconResolver((name, namespace) =>
      // Only our own names resolve, to files the build copied from the package.
      !namespace && known.has(name)
        ? this.sanitizer.bypassSecurityTrustResourceUrl(iconUrl(name))
        : null,
    );
  }
}
