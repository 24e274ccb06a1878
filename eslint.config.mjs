import tseslint from 'typescript-eslint';
import nextPlugin from '@next/eslint-plugin-next';
import reactHooks from 'eslint-plugin-react-hooks';

const pureFolders = ['lib/rules', 'lib/stats', 'lib/capnogram', 'lib/note', 'lib/ingest', 'lib/export', 'lib/domain', 'lib/demo', 'lib/_shared', 'lib/indicators', 'lib/review'];

export default tseslint.config(
  { ignores: ['node_modules/**', '.next/**', '.next-*/**', 'lib/db/generated/**', 'lib/db/generated-pg/**', 'data/**', 'tests/artifacts/**', 'next-env.d.ts'] },
  ...tseslint.configs.recommended,
  {
    plugins: { '@next/next': nextPlugin, 'react-hooks': reactHooks },
    rules: {
      ...nextPlugin.configs.recommended.rules,
      'react-hooks/rules-of-hooks': 'error',
      'react-hooks/exhaustive-deps': 'warn',
      '@next/next/no-html-link-for-pages': 'off',
      '@typescript-eslint/no-unused-vars': ['error', { argsIgnorePattern: '^_', varsIgnorePattern: '^_' }],
    },
  },
  {
    // The functional core stays pure: no framework, database, file system, environment or clock.
    files: pureFolders.map((f) => `${f}/**/*.ts`),
    rules: {
      'no-restricted-imports': [
        'error',
        {
          paths: [
            { name: 'node:fs', message: 'lib core modules are pure: pass data in.' },
            { name: 'fs', message: 'lib core modules are pure: pass data in.' },
            { name: 'node:fs/promises', message: 'lib core modules are pure: pass data in.' },
          ],
          patterns: [
            { group: ['next', 'next/*'], message: 'lib core modules must not import Next.' },
            { group: ['@prisma/*', '**/db/generated/*'], message: 'Only lib/db imports Prisma.' },
          ],
        },
      ],
      'no-restricted-properties': [
        'error',
        { object: 'process', property: 'env', message: 'Pass configuration in as an argument.' },
        { object: 'Date', property: 'now', message: 'Pass the time in as an argument.' },
      ],
      'no-restricted-globals': ['error', { name: 'process', message: 'lib core modules are pure.' }],
    },
  },
);
