import { provideHttpClient, withFetch, withInterceptors, withXsrfConfiguration } from '@angular/common/http';
import {
  ApplicationConfig,
  ErrorHandler,
  inject,
  provideAppInitializer,
  provideBrowserGlobalErrorListeners,
  provideZonelessChangeDetection,
} from '@angular/core';
import { MAT_FORM_FIELD_DEFAULT_OPTIONS } from '@angular/material/form-field';
import { MAT_ICON_DEFAULT_OPTIONS } from '@angular/material/icon';
import { provideRouter, withComponentInputBinding } from '@angular/router';
import { routes } from './app.routes';
import { authInterceptor } from './core/auth/auth.interceptor';
import { Session } from './core/auth/session';
import { NoticeErrorHandler } from './core/notice-error-handler';
import { provideFirmDates } from './shared/dates/firm-date-adapter';

export const appConfig: ApplicationConfig = {
  providers: [
    provideZonelessChangeDetection(),
    provideBrowserGlobalErrorListeners(),
    provideRouter(routes, withComponentInputBinding()),
    provideHttpClient(
      withFetch(),
      // The server's CSRF check uses Angular's defaults: cookie XSRF-TOKEN, header X-XSRF-TOKEN
      // (sent on relative-URL writes only, which is all this app makes).
      withXsrfConfiguration({ cookieName: 'XSRF-TOKEN', headerName: 'X-XSRF-TOKEN' }),
      withInterceptors([authInterceptor]),
    ),
    // Ask who is signed in at once, without holding up the first paint; guards wait for it.
    provideAppInitializer(() => void inject(Session).load()),
    // The static symbols font from @fontsource registers this family name; see styles.scss.
    { provide: MAT_ICON_DEFAULT_OPTIONS, useValue: { fontSet: 'material-symbols-outlined' } },
    { provide: ErrorHandler, useClass: NoticeErrorHandler },
    // Outlined fields (our field style); errors take the lines they need instead of a fixed one.
    { provide: MAT_FORM_FIELD_DEFAULT_OPTIONS, useValue: { appearance: 'outline', subscriptSizing: 'dynamic' } },
    // Date fields write and read the app's one date format, in the firm's locale.
    provideFirmDates(),
  ],
};
