import type { AbstractControl, FormGroupDirective, NgForm } from '@angular/forms';
import type { ErrorStateMatcher } from '@angular/material/core';

/**
 * The one wording for form errors across the app. `server` holds a message the API sent for this
 * field; it wins because it is the rule that actually refused the value.
 */
export function fieldErrorText(control: AbstractControl | null, label: string, unit = ''): string {
  const e = control?.errors;
  if (!e) return '';
  if (typeof e['server'] === 'string') return e['server'];
  if (e['required']) return `${label} is required.`;
  if (e['email']) return 'Enter an e-mail address like name@example.com.';
  if (e['maxlength']) return `${label} can be at most ${e['maxlength'].requiredLength} characters.`;
  if (e['minlength']) return `${label} needs at least ${e['minlength'].requiredLength} characters.`;
  if (e['whitespace']) return `${label} cannot be only spaces.`;
  if (typeof e['hint'] === 'string') return e['hint'];
  if (e['integer']) return `${label} must be a whole number.`;
  if (e['min']) return `${label} must be at least ${e['min'].min}${unit ? ' ' + unit : ''}.`;
  if (e['max']) return `${label} can be at most ${e['max'].max}${unit ? ' ' + unit : ''}.`;
  if (e['positive']) return `${label} must be more than 0${unit ? ' ' + unit : ''}.`;
  return `${label} is not valid.`;
}

/** A whole number, or empty (leave emptiness to `required`). */
export const integer = (c: AbstractControl) =>
  c.value !== null && c.value !== '' && !Number.isInteger(c.value) ? { integer: true } : null;
/** More than zero, or empty. */
export const positive = (c: AbstractControl) =>
  typeof c.value === 'number' && !(c.value > 0) ? { positive: true } : null;
/** A pattern whose failure message says what is allowed, in the words the server uses. */
export const patternWithHint =
  (pattern: RegExp, hint: string) =>
  (c: AbstractControl): { hint: string } | null =>
    typeof c.value === 'string' && c.value !== '' && !pattern.test(c.value) ? { hint } : null;

/** Shows an error as soon as the user has typed in the field (not only after leaving it). */
export const asYouType: ErrorStateMatcher = {
  isErrorState: (control: AbstractControl | null, form: FormGroupDirective | NgForm | null) =>
    !!control && control.invalid && (control.dirty || control.touched || !!form?.submitted),
};

/** Puts the API's field messages on the matching controls; they clear when the value changes. */
export function applyServerErrors(controls: Record<string, AbstractControl>, fields: Record<string, string>): string[] {
  const unmatched: string[] = [];
  for (const [name, message] of Object.entries(fields)) {
    const control = controls[name];
    if (control) {
      control.setErrors({ ...(control.errors ?? {}), server: message });
      control.markAsTouched();
    } else unmatched.push(message);
  }
  return unmatched;
}
