// @ts-check
// Lint rules for the whole tree: typescript-eslint's recommended set everywhere, Angular's own
// rules for the app's components and templates, and the boundaries between features.
const js = require('@eslint/js');
const tseslint = require('typescript-eslint');
const angular = require('angular-eslint');

module.exports = tseslint.config(
  { ignores: ['dist/**', 'node_modules/**', '.angular/**', 'coverage/**', 'test-results/**', 'test/fixtures/**', '.data/**'] },
  {
    files: ['**/*.ts'],
    extends: [js.configs.recommended, ...tseslint.configs.recommended],
    rules: {
      // Unused names are errors, except a deliberate `_` prefix (callbacks whose shape is fixed).
      '@typescript-eslint/no-unused-vars': ['error', { argsIgnorePattern: '^_', varsIgnorePattern: '^_', caughtErrors: 'none' }],
    },
  },
  {
    files: ['src/**/*.ts'],
    extends: [...angular.configs.tsRecommended],
    processor: angular.processInlineTemplates,
    rules: {
      '@angular-eslint/directive-selector': ['error', { type: 'attribute', prefix: 'fw', style: 'camelCase' }],
      '@angular-eslint/component-selector': ['error', { type: 'element', prefix: 'fw', style: 'kebab-case' }],
      '@angular-eslint/prefer-on-push-component-change-detection': 'error',
    },
  },
  {
    files: ['src/**/*.html'],
    extends: [...angular.configs.templateRecommended, ...angular.configs.templateAccessibility],
  },
  {
    // Closures is hosted by Walk's visit page; what both need lives in features/field-day.
    files: ['src/app/features/closures/**/*.ts'],
    rules: {
      'no-restricted-imports': [
        'error',
        {
          patterns: [
            {
              group: ['**/features/walk/**', '../walk/*'],
              message: 'closures must not import walk: put what both need in features/field-day',
            },
          ],
        },
      ],
    },
  },
  {
    // The production server and shared code never reach into the app, the tools or the tests.
    files: ['server/**/*.ts', 'shared/**/*.ts'],
    ignores: ['**/*.spec.ts'],
    rules: {
      'no-restricted-imports': [
        'error',
        {
          patterns: [
            {
              group: ['**/src/app/**', '**/tools/**', '**/test/**'],
              message: 'server and shared code must not import the app, tools or tests',
            },
          ],
        },
      ],
    },
  },
  {
    // API and browser tests read JSON answers whose shape the test itself asserts.
    files: ['test/**/*.ts', '**/*.spec.ts', 'tools/bench-*.d/**/*.ts'],
    rules: { '@typescript-eslint/no-explicit-any': 'off' },
  },
  {
    files: ['**/*.js'],
    extends: [js.configs.recommended],
    languageOptions: {
      sourceType: 'commonjs',
      globals: { require: 'readonly', module: 'writable', process: 'readonly', __dirname: 'readonly', console: 'readonly' },
    },
  },
);
