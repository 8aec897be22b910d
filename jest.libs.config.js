// Unit tests of the shared libraries (libs/*): plain TypeScript through SWC, no services needed.
/** @type {import('jest').Config} */
module.exports = {
  displayName: 'libs',
  rootDir: __dirname,
  testEnvironment: 'node',
  testMatch: ['<rootDir>/libs/**/*.spec.ts'],
  transform: {
    '^.+\\.ts$': [
      '@swc/jest',
      { jsc: { parser: { syntax: 'typescript' }, target: 'es2022' }, module: { type: 'commonjs' } },
    ],
  },
  moduleNameMapper: {
    '^@trabeate/(.*)$': '<rootDir>/libs/$1/src/index.ts',
  },
};
