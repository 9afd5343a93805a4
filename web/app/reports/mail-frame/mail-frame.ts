import { ChangeDetectionStrategy, Component, computed, inject, input } from '@angular/core';
import { DomSanitizer } from '@angular/platform-browser';

/**
 * A message's HTML part in a fully sandboxed frame: no scripts, no forms, no same-origin access,
 * so the mail is shown as it will be read and can touch nothing of the app.
 */
@Component({
  selector: 'tb-mail-frame',
  template: `<iframe
    sandbox=""
    [srcdoc]="document()"
    [title]="label()"
    referrerpolicy="no-referrer"
  ></iframe>`,
  styles: `
    :host {
      display: block;
    }
    iframe {
      display: block;
      /* The border inside the width: a full-width frame must not make its tab scroll sideways. */
      box-sizing: border-box;
      width: 100%;
      height: var(--tb-mail-frame-height, 640px);
      border: 1px solid var(--tb-line);
      border-radius: 8px;
      background: #ffffff;
    }
  `,
  changeDetection: ChangeDetectionStrategy.OnPush,
})
export class MailFrame {
  private readonly sanitizer = inject(DomSanitizer);
  readonly html = input.required<string>();
  readonly label = input('The message as it will be read');

  // Angular's sanitizer would strip the mail's inline styles; the empty sandbox is what keeps
  // the frame harmless (HTML Living Standard, "the iframe element", sandbox attribute).
  protected readonly document = computed(() => this.sanitizer.bypassSecurityTrustHtml(this.html()));
}
