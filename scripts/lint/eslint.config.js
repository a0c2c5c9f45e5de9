// ESLint for the whole repository (run by scripts/test and `npm run lint`). Kept under scripts/ so the
// top level holds only what every contributor needs; the command names this file with --config.
import js from '@eslint/js';
import tseslint from 'typescript-eslint';
import reactHooks from 'eslint-plugin-react-hooks';
import jsxA11y from 'eslint-plugin-jsx-a11y';
import { importX } from 'eslint-plugin-import-x';
import { createTypeScriptImportResolver } from 'eslint-import-resolver-typescript';
import prettier from 'eslint-config-prettier';
import globals from 'globals';
import { fileURLToPath } from 'node:url';

const root = fileURLToPath(new URL('../../', import.meta.url));

export default tseslint.config(
  { ignores: ['dist/**', 'node_modules/**', 'test-output/**', '.data/**', 'backups/**'] },
  js.configs.recommended,
  ...tseslint.configs.recommended,
  {
    languageOptions: { globals: { ...globals.node }, parserOptions: { tsconfigRootDir: root } },
    plugins: { 'import-x': importX },
    settings: { 'import-x/resolver-next': [createTypeScriptImportResolver({ project: `${root}tsconfig.json` })] },
    rules: {
      // An import cycle makes module start-up order matter and hides layering mistakes.
      'import-x/no-cycle': ['error', { ignoreExternal: true }],
      '@typescript-eslint/no-unused-vars': ['error', { argsIgnorePattern: '^_', varsIgnorePattern: '^_', caughtErrors: 'none', ignoreRestSiblings: true }],
    },
  },
  {
    files: ['frontend/**/*.{ts,tsx}'],
    languageOptions: { globals: { ...globals.browser } },
    plugins: { 'react-hooks': reactHooks, 'jsx-a11y': jsxA11y },
    rules: {
      'react-hooks/rules-of-hooks': 'error',
      'react-hooks/exhaustive-deps': 'error',
      ...jsxA11y.flatConfigs.recommended.rules,
      // A table that scrolls sideways on a phone is a focusable region (axe: scrollable-region-focusable).
      // Choice cards nest the label's words two spans deep.
      'jsx-a11y/label-has-associated-control': ['error', { depth: 3 }],
      'jsx-a11y/no-noninteractive-tabindex': ['error', { tags: [], roles: ['tabpanel', 'region'] }],
    },
  },
  {
    // Tests and test support read JSON answers of every shape; `any` there is a reading aid, not a type hole.
    files: ['**/*.test.ts', '**/*.test.tsx', 'tests/**/*.ts', 'scripts/bench/**/*.ts'],
    rules: { '@typescript-eslint/no-explicit-any': 'off' },
  },
  { linterOptions: { reportUnusedDisableDirectives: 'error' } },
  prettier,
);
