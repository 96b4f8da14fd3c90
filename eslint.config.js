// @ts-check
/**
 * ESLint (flat config): JavaScript and typescript-eslint recommended rules everywhere, angular-eslint's
 * recommended rules for the app's TypeScript and its templates (inline and .html), with the template
 * accessibility rules on. Formatting is Prettier's job (`npm run format:check`), not ESLint's.
 */
import { defineConfig } from 'eslint/config';
import js from '@eslint/js';
import tseslint from 'typescript-eslint';
import angular from 'angular-eslint';
import globals from 'globals';

export default defineConfig(
  {
    ignores: ['dist/', 'node_modules/', '.angular/', 'coverage/', 'out-tsc/', 'test-results/', 'uploads/', 'data/', 'public/', 'reports/'],
  },
  {
    files: ['**/*.ts', '**/*.js', '**/*.mjs'],
    extends: [js.configs.recommended, tseslint.configs.recommended],
    languageOptions: { globals: { ...globals.node } },
    rules: {
      // Unused names are errors, except the ones deliberately named with a leading underscore.
      '@typescript-eslint/no-unused-vars': [
        'error',
        { argsIgnorePattern: '^_', varsIgnorePattern: '^_', caughtErrorsIgnorePattern: '^_', ignoreRestSiblings: true },
      ],
      eqeqeq: ['error', 'smart'],
    },
  },
  {
    files: ['src/**/*.ts'],
    extends: [angular.configs.tsRecommended],
    processor: angular.processInlineTemplates,
    languageOptions: { globals: { ...globals.browser } },
    rules: {
      '@angular-eslint/component-selector': ['error', { type: 'element', prefix: 'app', style: 'kebab-case' }],
      '@angular-eslint/directive-selector': ['error', { type: 'attribute', prefix: 'app', style: 'camelCase' }],
      // The app's conventions (DEVELOPERS.md): OnPush everywhere, signals for state.
      '@angular-eslint/prefer-on-push-component-change-detection': 'error',
      '@angular-eslint/prefer-signals': 'error',
    },
  },
  {
    files: ['src/**/*.html'],
    extends: [angular.configs.templateRecommended, angular.configs.templateAccessibility],
    rules: {
      // The app's conventions: built-in control flow, typed templates, buttons that never submit by accident.
      '@angular-eslint/template/prefer-control-flow': 'error',
      '@angular-eslint/template/prefer-self-closing-tags': 'error',
      '@angular-eslint/template/no-any': 'error',
      '@angular-eslint/template/button-has-type': 'error',
    },
  },
);
