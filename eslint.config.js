// @ts-check
// Lint rules for the whole tree; Prettier owns the layout (eslint-config-prettier turns off the
// rules that would fight it). Import boundaries keep each layer where docs/decisions and
// DEVELOPERS.md say it runs.
import js from '@eslint/js';
import astro from 'eslint-plugin-astro';
import reactHooks from 'eslint-plugin-react-hooks';
import prettier from 'eslint-config-prettier';
import globals from 'globals';
import tseslint from 'typescript-eslint';

/** No import climbs more than two folders: deeper code is reached through the "#…" subpaths. */
const noDeepClimb = {
  group: ['../../../*'],
  message: 'Use a #lib/… (or #components/…) subpath import.',
};

export default tseslint.config(
  { ignores: ['node_modules/', 'dist/', '.astro/', '.data/', 'public/'] },
  js.configs.recommended,
  ...tseslint.configs.recommended,
  ...astro.configs['flat/recommended'],
  {
    languageOptions: { globals: { ...globals.node, ...globals.browser } },
    rules: {
      '@typescript-eslint/no-unused-vars': [
        'error',
        { argsIgnorePattern: '^_', varsIgnorePattern: '^_', caughtErrors: 'none' },
      ],
      'no-restricted-imports': ['error', { patterns: [noDeepClimb] }],
      'no-empty': ['error', { allowEmptyCatch: true }],
    },
  },
  {
    files: ['**/*.tsx'],
    plugins: { 'react-hooks': reactHooks },
    rules: {
      'react-hooks/rules-of-hooks': 'error',
      'react-hooks/exhaustive-deps': 'error',
    },
  },
  {
    // Islands and the browser-side helpers never reach server code.
    files: ['src/components/**/*.tsx', 'src/lib/client/**'],
    rules: {
      'no-restricted-imports': [
        'error',
        {
          patterns: [
            noDeepClimb,
            {
              group: ['#lib/server/*', '**/lib/server/*', '**/server/*'],
              message: 'Islands and src/lib/client never import src/lib/server.',
            },
          ],
        },
      ],
    },
  },
  {
    // The engine is pure: it imports nothing outside its own folder.
    files: ['src/lib/analysis/**'],
    rules: {
      'no-restricted-imports': [
        'error',
        {
          patterns: [
            { regex: '^(?!\\./)', message: 'src/lib/analysis imports only from its own folder.' },
          ],
        },
      ],
    },
  },
  {
    // An API answer names its schema (answer(schema, body)), the one the OpenAPI document
    // publishes; json() is for the few plain answers outside /api/v1.
    files: ['src/pages/api/v1/**'],
    rules: {
      'no-restricted-imports': [
        'error',
        {
          patterns: [noDeepClimb],
          paths: [
            {
              name: '#lib/server/http/problem.ts',
              importNames: ['json'],
              message:
                'Answer with answer(schema, body) and the answer’s schema from src/lib/shared.',
            },
          ],
        },
      ],
    },
  },
  {
    // Migrations take Kysely<any> by design: they must not depend on today's Database type.
    files: ['migrations/**', 'src/lib/server/db/migrate.ts'],
    rules: { '@typescript-eslint/no-explicit-any': 'off' },
  },
  {
    // Migrations are frozen in time: Kysely and Node only, nothing from the project.
    files: ['migrations/**'],
    rules: {
      'no-restricted-imports': [
        'error',
        {
          patterns: [{ regex: '^(#|\\.)', message: 'Migrations import nothing from the project.' }],
        },
      ],
    },
  },
  prettier,
);
