import js from '@eslint/js';
import tseslint from 'typescript-eslint';
import { readFileSync } from 'node:fs';
import { URL } from 'node:url';

// The house import rule (DEVELOPERS.md, "Architecture"): app/layers.json says which folder may
// import which; a folder is imported only through its index.ts; no Leaflet, Lit or page globals
// below the map. tests/unit/import-rules.test.ts checks the same table.
const layers = JSON.parse(readFileSync(new URL('./app/layers.json', import.meta.url), 'utf8'));

function importRules() {
  const folders = Object.keys(layers.folders);
  const browser = {
    group: layers.browserLibraries.flatMap((b) => (b.endsWith('/') ? [`${b}*`] : [b, `${b}/*`])),
    message: 'No Leaflet or Lit below the map (app/layers.json).',
  };
  const block = (files, prefix, may, pure) => {
    const banned = folders.filter((f) => !may.includes(f));
    const patterns = [
      {
        regex: `^${prefix}(${folders.join('|')})/`,
        message: `Import another folder through its door: '${prefix.replace(/\\/g, '')}<folder>' (its index.ts).`,
      },
      ...(banned.length
        ? [
            {
              regex: `^${prefix}(${banned.join('|')})(/.*)?$`,
              message: `This folder may import ${may.join(', ') || 'nothing of ours'} (app/layers.json).`,
            },
          ]
        : []),
      ...(pure ? [browser] : []),
    ];
    return {
      files,
      rules: {
        'no-restricted-imports': ['error', { patterns }],
        ...(pure
          ? { 'no-restricted-globals': ['error', 'window', 'document', 'localStorage'] }
          : {}),
      },
    };
  };
  const pure = (f) => layers.noBrowserLibraries.includes(f);
  return [
    ...folders.map((f) => block([`app/${f}/**/*.ts`], '\\.\\./', layers.folders[f], pure(f))),
    ...Object.entries(layers.topLevel).map(([file, may]) =>
      block([`app/${file}`], '\\./', may, pure(file.replace(/\.ts$/, '')) || file !== 'main.ts'),
    ),
  ];
}

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
  ...importRules(),
);
