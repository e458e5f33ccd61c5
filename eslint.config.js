import js from '@eslint/js';
import tseslint from 'typescript-eslint';

export default tseslint.config(
  {
    ignores: [
      'dist/**',
      'node_modules/**',
      'test-output/**',
      'scratch/**',
      // Written by scripts/gen-validator.ts (ajv standalone output), checked by a unit test.
      'app/plan/plan-validator.generated.js',
    ],
  },
  js.configs.recommended,
  ...tseslint.configs.recommended,
  {
    languageOptions: {
      globals: {
        console: 'readonly',
        process: 'readonly',
        window: 'readonly',
        document: 'readonly',
        self: 'readonly',
        performance: 'readonly',
        localStorage: 'readonly',
      },
    },
    rules: {
      '@typescript-eslint/no-unused-vars': ['error', { argsIgnorePattern: '^_' }],
    },
  },
  {
    // The core is pure: no DOM, no map, no UI (see CONVENTIONS layout).
    files: ['app/{model,plan,planner,safety,formats,brief}/**/*.ts'],
    rules: {
      'no-restricted-imports': [
        'error',
        { patterns: ['leaflet', 'lit', 'lit/*', '../map/*', '../ui/*', '../worker/*'] },
      ],
      'no-restricted-globals': ['error', 'window', 'document', 'localStorage'],
    },
  },
);
