import { ChangeDetectionStrategy, Component, input } from '@angular/core';

/**
 * The shapes a state can take. Each reads on its own in black and white: colour is a second
 * signal, never the only one.
 *  - open: a hollow ring (nothing done yet)
 *  - half: a ring half filled (under way)
 *  - wait: a hollow diamond (with someone else, waiting)
 *  - back: a solid triangle pointing left (sent back, needs attention)
 *  - done: a solid square with a tick (finished)
 *  - late: a clock face (past a date)
 *  - stop: a square with a bar (refused, failed)
 */
export type MarkerShape = 'open' | 'half' | 'wait' | 'back' | 'done' | 'late' | 'stop';
/** Colour family, applied on top of the shape: neutral ink, the accent, or the alert colour. */
export type MarkerTone = 'neutral' | 'accent' | 'alert';

/** A state shown as shape + words (+ colour). `<tb-state-marker shape="wait" tone="accent">Under review</tb-state-marker>` */
@Component({
  selector: 'tb-state-marker',
  template: `
    <svg class="shape" viewBox="0 0 16 16" aria-hidden="true" focusable="false">
      @switch (shape()) {
        @case ('open') {
          <circle cx="8" cy="8" r="5.5" fill="none" stroke="currentColor" stroke-width="2" />
        }
        @case ('half') {
          <circle cx="8" cy="8" r="5.5" fill="none" stroke="currentColor" stroke-width="2" />
          <path d="M8 2.5 A5.5 5.5 0 0 1 8 13.5 Z" fill="currentColor" />
        }
        @case ('wait') {
          <path d="M8 1.5 L14.5 8 L8 14.5 L1.5 8 Z" fill="none" stroke="currentColor" stroke-width="2" />
        }
        @case ('back') {
          <path d="M2 8 L13.5 2 L13.5 14 Z" fill="currentColor" />
        }
        @case ('done') {
          <rect x="1.5" y="1.5" width="13" height="13" fill="currentColor" />
          <path d="M4.5 8.3 L7 10.8 L11.8 5.5" fill="none" stroke="var(--tb-marker-on, #fff)" stroke-width="2" />
        }
        @case ('late') {
          <circle cx="8" cy="8" r="6" fill="none" stroke="currentColor" stroke-width="2" />
          <path d="M8 4.5 V8.5 H11" fill="none" stroke="currentColor" stroke-width="2" />
        }
        @case ('stop') {
          <rect x="2" y="2" width="12" height="12" fill="none" stroke="currentColor" stroke-width="2" />
          <path d="M4.5 8 H11.5" stroke="currentColor" stroke-width="2.5" />
        }
      }
    </svg>
    <span class="words"><ng-content /></span>
  `,
  host: { class: 'tb-state-marker', '[attr.data-shape]': 'shape()', '[attr.data-tone]': 'tone()' },
  styles: `
    :host {
      display: inline-flex;
      align-items: center;
      gap: 0.35rem;
      font-size: 0.875rem; /* 14 px: state words stay readable */
      font-weight: 700;
      line-height: 1.3;
      white-space: nowrap;
      color: var(--mat-sys-on-surface);
    }
    :host([data-tone='accent']) {
      color: var(--tb-focus-on-light, var(--mat-sys-primary));
    }
    :host([data-tone='alert']) {
      color: var(--mat-sys-error);
    }
    .shape {
      flex: none;
      width: 1em;
      height: 1em;
    }
  `,
  changeDetection: ChangeDetectionStrategy.OnPush,
})
export class StateMarker {
  readonly shape = input.required<MarkerShape>();
  readonly tone = input<MarkerTone>('neutral');
}
