import js from '@eslint/js';
import tseslint from 'typescript-eslint';
import svelte from 'eslint-plugin-svelte';
import globals from 'globals';

// Layer rules from DESIGN.md: core imports nothing from the layers above it or from
// UI, storage, imagery or desktop frameworks; the UI never touches Dexie or geotiff.js.
const coreForbidden = ['svelte', 'svelte/*', 'ol', 'ol/*', 'dexie', 'electron', 'geotiff'];
const coreForbiddenPaths = ['**/ui/**', '**/app/**', '**/store/**', '**/imagery/**', '**/platform/**', '**/cli/**'];
const corePatterns = [
  { group: coreForbidden, message: 'src/core is pure: no framework, storage, imagery or desktop imports.' },
  { group: coreForbiddenPaths, message: 'src/core must not import from the layers above it.' },
];

export default tseslint.config(
  { ignores: ['dist/**', 'dist-electron/**', 'node_modules/**', 'demo/**', 'e2e/artifacts/**', 'bench/out/**'] },
  js.configs.recommended,
  ...tseslint.configs.recommended,
  ...svelte.configs['flat/recommended'],
  {
    languageOptions: { globals: { ...globals.browser, ...globals.node } },
    rules: {
      '@typescript-eslint/no-unused-vars': ['error', { argsIgnorePattern: '^_', varsIgnorePattern: '^_' }],
    },
  },
  {
    files: ['**/*.svelte', '**/*.svelte.ts'],
    languageOptions: { parserOptions: { parser: tseslint.parser, extraFileExtensions: ['.svelte'] } },
  },
  {
    files: ['src/core/**/*.ts'],
    rules: {
      'no-restricted-imports': ['error', { patterns: corePatterns }],
      'no-restricted-globals': ['error', 'document', 'window', 'indexedDB', 'localStorage'],
    },
  },
  {
    // The TIFF inspector runs in a small worker at every open: it names CRSs from
    // crsNames.ts and never loads proj4.
    files: ['src/core/tiff/**/*.ts'],
    rules: {
      'no-restricted-imports': ['error', {
        patterns: [...corePatterns, { group: ['proj4', '**/crs.ts'], message: 'The TIFF inspector stays free of proj4: use ../crsNames.ts.' }],
      }],
    },
  },
  {
    files: ['src/ui/**/*.ts', 'src/ui/**/*.svelte'],
    rules: {
      'no-restricted-imports': ['error', {
        patterns: [{ group: ['dexie', 'geotiff'], message: 'The UI goes through src/app, src/store and src/imagery.' }],
      }],
    },
  },
);
