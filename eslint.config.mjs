// @ts-check
/**
 * ESLint flat config: the JavaScript and TypeScript recommended rule sets everywhere, and the
 * Angular rule sets (components, templates, template accessibility) for the web app.
 * Run with `npm run lint`; scripts/test-all.mjs runs it as one step of `npm test`.
 */
import js from '@eslint/js';
import angular from 'angular-eslint';
import tseslint from 'typescript-eslint';

export default tseslint.config(
  {
    ignores: [
      'dist/**',
      'node_modules/**',
      'coverage/**',
      '.angular/**',
      '.var/**',
      'migrations/**',
      'spec-artifacts/**',
      'backups/**',
      'data/**',
    ],
  },
  {
    files: ['**/*.ts', '**/*.mjs', '**/*.js'],
    extends: [js.configs.recommended, ...tseslint.configs.recommended],
    rules: {
      // Unused names are errors, except the conventional `_` prefix for a deliberately ignored one.
      '@typescript-eslint/no-unused-vars': ['error', { argsIgnorePattern: '^_', varsIgnorePattern: '^_', caughtErrorsIgnorePattern: '^_' }],
    },
  },
  {
    files: ['**/*.mjs', '**/*.js', 'scripts/**/*.ts', 'api/**/*.ts', 'spec/**/*.ts'],
    languageOptions: {
      globals: {
        process: 'readonly',
        console: 'readonly',
        Buffer: 'readonly',
        URL: 'readonly',
        setTimeout: 'readonly',
        clearTimeout: 'readonly',
        setInterval: 'readonly',
        clearInterval: 'readonly',
        fetch: 'readonly',
        AbortController: 'readonly',
        structuredClone: 'readonly',
        performance: 'readonly',
        TextEncoder: 'readonly',
        TextDecoder: 'readonly',
        queueMicrotask: 'readonly',
        setImmediate: 'readonly',
      },
    },
  },
  {
    files: ['web/**/*.ts'],
    extends: [...angular.configs.tsRecommended],
    processor: angular.processInlineTemplates,
    rules: {
      '@angular-eslint/directive-selector': ['error', { type: 'attribute', prefix: 'app', style: 'camelCase' }],
      '@angular-eslint/component-selector': ['error', { type: 'element', prefix: 'app', style: 'kebab-case' }],
    },
  },
  {
    // What the browser loads: `import { z } from 'zod'` hands the bundler zod's whole namespace
    // as one value, and with it every locale's error messages (about 260 kB of script, 45 kB on
    // the wire, on every first visit). `import * as z from 'zod'` lets it keep only what is used.
    files: ['web/**/*.ts', 'shared/**/*.ts'],
    rules: {
      'no-restricted-syntax': [
        'error',
        {
          selector:
            "ImportDeclaration[source.value='zod'][importKind!='type'] > :matches(ImportSpecifier[imported.name=/^(z|default|locales)$/][importKind!='type'], ImportDefaultSpecifier)",
          message: "Write `import * as z from 'zod'`: importing the namespace as a value bundles every zod locale into the web app.",
        },
      ],
    },
  },
  {
    files: ['web/**/*.html'],
    extends: [...angular.configs.templateRecommended, ...angular.configs.templateAccessibility],
  },
);
