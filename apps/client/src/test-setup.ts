import { setupZonelessTestEnv } from 'jest-preset-angular/setup-env/zoneless';

setupZonelessTestEnv({
  // Fail a test on unknown elements or properties instead of printing a warning.
  errorOnUnknownElements: true,
  errorOnUnknownProperties: true,
});
