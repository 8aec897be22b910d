import { effect } from '@angular/core';

/**
 * Fills a form once, when what it edits has loaded; later reloads never overwrite what is being
 * typed. Call in an injection context (a constructor or a field initialiser).
 */
export function fillOnce<T>(source: { hasValue(): boolean; value(): T | undefined }, fill: (value: T) => void): void {
  let filled = false;
  effect(() => {
    const value = source.hasValue() ? source.value() : undefined;
    if (filled || value === undefined) return;
    filled = true;
    fill(value);
  });
}
