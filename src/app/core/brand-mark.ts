import { ChangeDetectionStrategy, Component } from '@angular/core';

/**
 * Specimetry's mark: a test strip seen from above with a double notch at mid-length (the geometry the
 * product studies) and an amber dot where the neck carries the strain.
 */
@Component({
  selector: 'sm-brand-mark',
  changeDetection: ChangeDetectionStrategy.OnPush,
  template: `
    <svg viewBox="0 0 32 32" width="32" height="32" aria-hidden="true" focusable="false">
      <rect width="32" height="32" rx="7" class="tile" />
      <path class="strip" d="M8 6h16v5.5c-3.2 0-4.8 2-4.8 4.5s1.6 4.5 4.8 4.5V26H8v-5.5c3.2 0 4.8-2 4.8-4.5S11.2 11.5 8 11.5z" />
      <line class="gauge" x1="9.5" y1="8.5" x2="22.5" y2="8.5" />
      <line class="gauge" x1="9.5" y1="23.5" x2="22.5" y2="23.5" />
      <circle class="neck" cx="16" cy="16" r="2.2" />
    </svg>
  `,
  styles: `
    :host { display: inline-flex; }
    .tile { fill: var(--sm-on-topbar); opacity: 0.14; }
    .strip { fill: var(--sm-on-topbar); }
    .gauge { stroke: var(--sm-topbar); stroke-width: 1; opacity: 0.55; }
    .neck { fill: var(--sm-topbar-accent); }
  `,
})
export class BrandMark {}
