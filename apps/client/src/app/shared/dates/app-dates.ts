import { InjectionToken, Pipe, PipeTransform, inject } from '@angular/core';
import { DEFAULT_LOCALE, formatDay, formatDayTime, waitedFor } from '@trabeate/dates';

/** The firm's locale for dates and numbers; en-GB until the firm's settings carry one. */
export const FIRM_LOCALE = new InjectionToken<string>('FIRM_LOCALE', { factory: () => DEFAULT_LOCALE });

/** `{{ stage.dueDate | tbDay }}` → "20 Dec 2026". The only way screens write a calendar day. */
@Pipe({ name: 'tbDay' })
export class DayPipe implements PipeTransform {
  private readonly locale = inject(FIRM_LOCALE);
  transform(value: string | Date | null | undefined): string {
    return formatDay(value, { locale: this.locale });
  }
}

/** `{{ a.at | tbDayTime }}` → "20 Dec 2026, 14:05". The only way screens write an instant. */
@Pipe({ name: 'tbDayTime' })
export class DayTimePipe implements PipeTransform {
  private readonly locale = inject(FIRM_LOCALE);
  transform(value: string | Date | null | undefined): string {
    return formatDayTime(value, { locale: this.locale });
  }
}

/** `{{ s.submittedAt | tbWaited }}` → "3 days". Impure-free: recomputed when the value changes. */
@Pipe({ name: 'tbWaited' })
export class WaitedPipe implements PipeTransform {
  transform(value: string | null | undefined): string {
    return value ? waitedFor(value) : '';
  }
}
