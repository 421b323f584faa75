// One jest run, four projects: pure shared code and tools, the API on real PostgreSQL,
// Angular components (jsdom), and end-to-end tests in real Chromium (run last, in band).
const { createCjsPreset } = require('jest-preset-angular/presets');

const nodeTs = {
  testEnvironment: 'node',
  transform: { '^.+\\.ts$': ['ts-jest', { tsconfig: '<rootDir>/tsconfig.node-jest.json' }] },
  moduleFileExtensions: ['ts', 'js', 'json'],
};

module.exports = {
  // testTimeout is a global option (ignored inside projects); browser tests need the long one.
  testTimeout: 120000,
  projects: [
    {
      ...nodeTs,
      displayName: 'shared',
      testMatch: ['<rootDir>/shared/**/*.spec.ts', '<rootDir>/tools/**/*.spec.ts'],
    },
    {
      ...nodeTs,
      displayName: 'server',
      testMatch: ['<rootDir>/server/**/*.spec.ts', '<rootDir>/test/api/**/*.test.ts'],
      globalSetup: '<rootDir>/test/support/global-setup.ts',
    },
    {
      ...createCjsPreset({ tsconfig: '<rootDir>/tsconfig.jest.json' }),
      displayName: 'app',
      testMatch: ['<rootDir>/src/**/*.spec.ts'],
      setupFilesAfterEnv: ['<rootDir>/setup-jest.ts'],
      transformIgnorePatterns: ['node_modules/(?!(.*\\.mjs$))'],
    },
    {
      ...nodeTs,
      displayName: 'e2e',
      testMatch: ['<rootDir>/test/e2e/**/*.e2e.ts'],
    },
  ],
};
