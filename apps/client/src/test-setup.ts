import { setupZonelessTestEnv } from 'jest-preset-angular/setup-env/zoneless';

setupZonelessTestEnv({
  // Fail a test on unknown elements or properties instead of printing a warning.
  errorOnUnknownElements: true,
  errorOnUnknownProperties: true,
});

// The first render in a file compiles its components; on a busy two-core machine that alone can
// pass Jest's default 5 s, which says nothing about the component. (testTimeout is global in a
// multi-project run, so it is set here.)
jest.setTimeout(20_000);
