import fs from 'node:fs';
import js from '@eslint/js';
import importPlugin from 'eslint-plugin-import';
import reactHooks from 'eslint-plugin-react-hooks';
import globals from 'globals';
import tseslint from 'typescript-eslint';

// One zone per folder in src/features, read from disk, so a new feature is fenced in without editing this file:
// features do not import each other; the routes in src/app compose them.
const featureZones = fs
  .readdirSync(new URL('./src/features', import.meta.url), { withFileTypes: true })
  .filter((entry) => entry.isDirectory())
  .map(({ name }) => ({
    target: `./src/features/${name}`,
    from: './src/features',
    except: [`./${name}`],
    message: 'Features do not import each other; compose them in app/routes.',
  }));

export default tseslint.config(
  { ignores: ['dist/**', 'dist-server/**', 'node_modules/**', '.data/**', 'coverage/**'] },
  js.configs.recommended,
  ...tseslint.configs.recommended,
  {
    languageOptions: { globals: { ...globals.node, ...globals.browser } },
    plugins: { import: importPlugin },
    settings: { 'import/resolver': { typescript: { project: './tsconfig.json' }, node: true } },
    rules: {
      '@typescript-eslint/no-unused-vars': ['error', { argsIgnorePattern: '^_', varsIgnorePattern: '^_' }],
      '@typescript-eslint/consistent-type-imports': ['error', { fixStyle: 'inline-type-imports' }],
      'no-console': 'off',
      // One-way imports: shared/ stands alone; the server and the client never import each other.
      'import/no-restricted-paths': [
        'error',
        {
          zones: [
            { target: './shared', from: './src', message: 'shared/ must not import the client.' },
            { target: './shared', from: './server', message: 'shared/ must not import the server.' },
            { target: './src', from: './server', message: 'The client must not import the server.' },
            { target: './server', from: './src', message: 'The server must not import the client.' },
            ...featureZones,
            {
              target: './src/components',
              from: './src/features',
              message: 'Shared components must not import features.',
            },
            { target: './src/lib', from: './src/features', message: 'src/lib must not import features.' },
          ],
        },
      ],
      'import/no-cycle': ['error', { maxDepth: 10 }],
    },
  },
  {
    files: ['src/**/*.{ts,tsx}'],
    plugins: { 'react-hooks': reactHooks },
    rules: { 'react-hooks/rules-of-hooks': 'error', 'react-hooks/exhaustive-deps': 'warn' },
  },
  {
    files: ['shared/**/*.ts'],
    rules: {
      // No I/O in shared/: it runs in the browser and the server alike.
      'no-restricted-imports': ['error', { patterns: ['node:*', 'fs', 'path', 'typeorm', 'express'] }],
    },
  },
);
