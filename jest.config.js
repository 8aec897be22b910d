// One Jest run for every suite; scripts/test.ts starts the services the api and e2e suites need.
const swc = [
  '@swc/jest',
  { jsc: { parser: { syntax: 'typescript' }, target: 'es2022' }, module: { type: 'commonjs' } },
];
const aliases = { '^@trabeate/(.*)$': '<rootDir>/libs/$1/src/index.ts' };
// ESM-only packages that Jest's loader must transform to load them on Node 20.
const esmOnly = [
  'openid-client',
  'oauth4webapi',
  'jose',
  'oidc-provider',
  'file-type',
  'strtok3',
  'token-types',
  'uint8array-extras',
  '@tokenizer/inflate',
  '@borewit/text-codec',
].join('|');

const node = (displayName, testMatch, extra = {}) => ({
  displayName,
  rootDir: __dirname,
  testEnvironment: 'node',
  testMatch,
  transform: { '^.+\\.[cm]?[tj]s$': swc },
  transformIgnorePatterns: [`/node_modules/(?!(${esmOnly})/)`],
  moduleNameMapper: aliases,
  ...extra,
});

/** @type {import('jest').Config} */
module.exports = {
  projects: [
    require('./jest.libs.config.js'),
    '<rootDir>/apps/client/jest.config.mjs',
    node('api', ['<rootDir>/test/api/**/*.spec.ts', '<rootDir>/apps/server/src/**/*.spec.ts'], {
      setupFilesAfterEnv: ['<rootDir>/test/support/jest-setup-api.ts'],
    }),
    node('build', ['<rootDir>/test/build/**/*.spec.ts']),
    node('lint', ['<rootDir>/test/static/lint.spec.ts'], {
      setupFilesAfterEnv: ['<rootDir>/test/support/jest-timeout-static.ts'],
    }),
    node('typecheck', ['<rootDir>/test/static/typecheck.spec.ts'], {
      setupFilesAfterEnv: ['<rootDir>/test/support/jest-timeout-static.ts'],
    }),
    node('e2e', ['<rootDir>/test/e2e/**/*.spec.ts'], {
      setupFilesAfterEnv: ['<rootDir>/test/support/jest-timeout-e2e.ts'],
    }),
  ],
};
