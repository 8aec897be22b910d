// Client component tests: jest-preset-angular (zoneless) on jsdom 28.
// The preset package is CommonJS, so its helpers come from the default export.
import presets from 'jest-preset-angular/presets/index.js';

const { createCjsPreset } = presets;

/** @type {import('jest').Config} */
export default {
  ...createCjsPreset({
    tsconfig: '<rootDir>/tsconfig.spec.json',
    // The preset's own environment wraps the jsdom this repo installs (28), not an older copy.
    testEnvironment: 'jest-preset-angular/environments/jest-jsdom-env',
  }),
  displayName: 'client',
  rootDir: import.meta.dirname,
  roots: ['<rootDir>/src'],
  setupFilesAfterEnv: ['<rootDir>/src/test-setup.ts'],
  moduleNameMapper: {
    '^@trabeate/(.*)$': '<rootDir>/../../libs/$1/src/index.ts',
    // Workers need import.meta, which Jest's CommonJS cannot run: the planning page's engine
    // worker is answered in the same thread instead (the protocol module is tested directly).
    '^\\./plan-worker-factory$': '<rootDir>/src/app/features/planning/plan-worker-factory.in-thread.ts',
  },
  cacheDirectory: '<rootDir>/../../tmp/jest-client',
};
