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
  // core/ is pure computation: no Node, DOM or Electron imports (see DEVELOPERS.md). The layers inside core/
  // run one way (DEVELOPERS.md "Import rules"): each folder below lists the core/ folders it must not import,
  // so an import that runs back up a layer is a lint error. One config per folder, because a later
  // `no-restricted-imports` replaces an earlier one for the same file rather than adding to it.
  ...coreLayerConfigs(),
);

function coreLayerConfigs() {
  const pure = ['node:*', 'fs', 'path', 'electron', 'three', 'chart.js', 'child_process', 'worker_threads'];
  const above = (...folders) => folders.map((f) => `**/${f}/**`);
  const layers = {
    linalg: above('conic', 'descent', 'terrain', 'study', 'footprint', 'export', 'parallel', 'cli'),
    conic: above('descent', 'terrain', 'study', 'footprint', 'export', 'parallel', 'cli'),
    descent: above('terrain', 'study', 'footprint', 'export', 'parallel', 'cli'),
    terrain: above('conic', 'descent', 'study', 'footprint', 'export', 'parallel', 'cli'),
    study: above('terrain', 'footprint', 'export', 'parallel', 'cli'),
    parallel: above('linalg', 'conic', 'descent', 'terrain', 'study', 'footprint', 'export', 'cli'),
    footprint: above('export', 'cli'),
    export: above('cli', 'parallel'),
  };
  const message = (folder) => `core/${folder} may not import this (core/ layers run one way: DEVELOPERS.md "Import rules")`;
  const configs = Object.entries(layers).map(([folder, forbidden]) => ({
    files: [`core/${folder}/**/*.ts`],
    ignores: ['core/parallel/node*.ts'],
    rules: {
      'no-restricted-imports': ['error', { patterns: [{ group: pure, message: 'core/ is pure computation: no Node, DOM or Electron imports' }, { group: forbidden, message: message(folder) }] }],
    },
  }));
  // The Node adapter of core/parallel may use node:*, but not the layers above it.
  configs.push({
    files: ['core/parallel/node*.ts'],
    rules: { 'no-restricted-imports': ['error', { patterns: [{ group: layers.parallel, message: message('parallel') }] }] },
  });
  return configs;
}
