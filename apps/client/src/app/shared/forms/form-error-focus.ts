import { LiveAnnouncer } from '@angular/cdk/a11y';
import { ElementRef, inject } from '@angular/core';
import { FormArray, FormGroup, type AbstractControl } from '@angular/forms';

/** How many fields (leaf controls) are in error, nested groups and arrays included. */
export function countInvalidFields(control: AbstractControl): number {
  if (control instanceof FormGroup || control instanceof FormArray) {
    return Object.values(control.controls).reduce((n: number, c: AbstractControl) => n + countInvalidFields(c), 0);
  }
  return control.invalid && control.enabled ? 1 : 0;
}

/** The first field in error in reading order (the DOM's), or null. */
export function firstInvalidField(host: HTMLElement): HTMLElement | null {
  return host.querySelector<HTMLElement>(
    'input.ng-invalid:not([type=hidden]), textarea.ng-invalid, select.ng-invalid, mat-select.ng-invalid, .mat-mdc-select.ng-invalid, [role=radiogroup].ng-invalid, mat-radio-group.ng-invalid',
  );
}

export function fieldCountText(n: number): string {
  return n === 1 ? '1 field needs attention.' : `${n} fields need attention.`;
}

/**
 * What a failed submit does on every form: show every error, move focus to the first field in
 * error (not leave it on the button) and say how many there are to a screen reader.
 * Call `formErrorFocus()` in a component's field initialiser; call the result on a failed submit.
 * Returns the count, for a visible summary beside the button. `within` narrows the search for the
 * field to focus to one form's element, for a component with several forms (an empty create field
 * above the table must not take the focus from the row being renamed).
 */
export function formErrorFocus(): (form: AbstractControl, within?: Element | null) => number {
  const host = inject(ElementRef<HTMLElement>).nativeElement as HTMLElement;
  const announcer = inject(LiveAnnouncer);
  return (form, within) => {
    form.markAllAsTouched();
    const n = countInvalidFields(form);
    if (n > 0) {
      firstInvalidField((within as HTMLElement | null | undefined) ?? host)?.focus();
      void announcer.announce(fieldCountText(n), 'assertive');
    }
    return n;
  };
}
