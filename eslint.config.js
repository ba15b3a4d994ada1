import js from '@eslint/js';
import importPlugin from 'eslint-plugin-import';
import reactHooks from 'eslint-plugin-react-hooks';
import globals from 'globals';
import tseslint from 'typescript-eslint';

export default tseslint.config(
  { ignores: ['dist/**', 'node_modules/**', '.data/**', 'coverage/**'] },
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
            {
              target: './src/features/auth',
              from: './src/features',
              except: ['./auth'],
              message: 'Features do not import each other; compose them in app/routes.',
            },
            {
              target: './src/features/users',
              from: './src/features',
              except: ['./users'],
              message: 'Features do not import each other; compose them in app/routes.',
            },
            {
              target: './src/features/ageing',
              from: './src/features',
              except: ['./ageing'],
              message: 'Features do not import each other; compose them in app/routes.',
            },
            {
              target: './src/features/waiting',
              from: './src/features',
              except: ['./waiting'],
              message: 'Features do not import each other; compose them in app/routes.',
            },
            {
              target: './src/features/mailbox',
              from: './src/features',
              except: ['./mailbox'],
              message: 'Features do not import each other; compose them in app/routes.',
            },
            {
              target: './src/features/evaluation',
              from: './src/features',
              except: ['./evaluation'],
              message: 'Features do not import each other; compose them in app/routes.',
            },
            {
              target: './src/features/catalogue',
              from: './src/features',
              except: ['./catalogue'],
              message: 'Features do not import each other; compose them in app/routes.',
            },
            {
              target: './src/features/claims',
              from: './src/features',
              except: ['./claims'],
              message: 'Features do not import each other; compose them in app/routes.',
            },
            {
              target: './src/components',
              from: './src/features',
              message: 'Shared components must not import features.',
            },
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
