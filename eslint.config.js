import js from '@eslint/js';
import tseslint from 'typescript-eslint';
import globals from 'globals';

export default tseslint.config(
  { ignores: ['node_modules/', '.bench-venv/', 'test-artifacts/', 'dist/', 'dist-cli/', 'dist-electron/', 'release/', 'coverage/', '**/*.svelte', 'core/linalg/wasm/assembly/', 'core/conic/wasm/assembly/'] },
  js.configs.recommended,
  ...tseslint.configs.recommended,
  {
    languageOptions: { globals: { ...globals.node, ...globals.browser } },
    rules: {
      '@typescript-eslint/no-unused-vars': ['error', { argsIgnorePattern: '^_', varsIgnorePattern: '^_' }],
      'no-constant-condition': ['error', { checkLoops: false }],
    },
  },
  {
    // core/ is pure computation: no Node, DOM or Electron imports (see DEVELOPERS.md).
    files: ['core/**/*.ts'],
    ignores: ['core/cli/**', 'core/parallel/node*.ts'],
    rules: {
      'no-restricted-imports': ['error', { patterns: ['node:*', 'fs', 'path', 'electron', 'three', 'chart.js', 'child_process', 'worker_threads'] }],
    },
  },
);
