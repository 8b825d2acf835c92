import js from '@eslint/js';
import tseslint from 'typescript-eslint';
import svelte from 'eslint-plugin-svelte';
import globals from 'globals';

export default tseslint.config(
  { ignores: ['dist/', 'release/', 'node_modules/', 'test-output/', 'coverage/'] },
  js.configs.recommended,
  ...tseslint.configs.recommended,
  ...svelte.configs.recommended,
  {
    languageOptions: { globals: { ...globals.node } },
    rules: {
      '@typescript-eslint/no-unused-vars': ['error', { argsIgnorePattern: '^_', varsIgnorePattern: '^_' }],
    },
  },
  {
    files: ['src-renderer/**/*.{ts,svelte}', '**/*.svelte.ts'],
    languageOptions: { globals: { ...globals.browser } },
  },
  {
    files: ['**/*.svelte', '**/*.svelte.ts'],
    languageOptions: { parserOptions: { parser: tseslint.parser, extraFileExtensions: ['.svelte'] } },
  },
  {
    // Only the three files in src-main/electron may talk to Electron.
    files: ['**/*.{ts,js,svelte}'],
    ignores: ['src-main/electron/**'],
    rules: { 'no-restricted-imports': ['error', { paths: ['electron'] }] },
  },
  {
    // The core must stay free of Node, DOM and Electron so that every host computes the same thing.
    files: ['shared-core/**/*.ts'],
    rules: {
      'no-restricted-imports': [
        'error',
        { patterns: ['node:*', 'fs', 'path', 'crypto', 'electron', 'exceljs', 'pdfkit', 'papaparse'] },
      ],
    },
  },
);
