import { ChangeDetectionStrategy, Component, input } from '@angular/core';

/**
 * Descentry's mark: a road falling away from a plateau, with the recovered energy as a warm dot.
 * Decorative: the product name always sits next to it.
 */
@Component({
  selector: 'app-brand-mark',
  template: `
    <svg [attr.width]="sizePx()" [attr.height]="sizePx()" viewBox="0 0 32 32" aria-hidden="true" focusable="false">
      <rect width="32" height="32" rx="7" fill="currentColor" opacity="0.16" />
      <path d="M5 9 L13 9 L27 23" fill="none" stroke="currentColor" stroke-width="3.2" stroke-linecap="round" stroke-linejoin="round" />
      <circle cx="23" cy="10" r="3.2" fill="#ffb86f" />
    </svg>
  `,
  styles: ':host { display: inline-flex; }',
  changeDetection: ChangeDetectionStrategy.OnPush,
})
export class BrandMark {
  /** Width and height in CSS pixels. */
  readonly sizePx = input(32);
}
