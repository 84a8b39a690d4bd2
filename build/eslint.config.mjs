// ESLint flat config, run as `eslint -c build/eslint.config.mjs .` from the repository root.
import js from '@eslint/js';
import tseslint from 'typescript-eslint';
import layers from './eslint-layers.mjs';

const nodeGlobals = {
  process: 'readonly',
  console: 'readonly',
  Buffer: 'readonly',
  URL: 'readonly',
  performance: 'readonly',
  setTimeout: 'readonly',
  clearTimeout: 'readonly',
};

export default tseslint.config(
  { ignores: ['dist/**', 'node_modules/**', 'release/**', 'test-output/**'] },
  js.configs.recommended,
  ...tseslint.configs.recommended,
  {
    files: ['**/*.mjs', '**/*.cjs', '**/*.js'],
    languageOptions: { globals: nodeGlobals },
  },
  {
    rules: {
      // Unused names are errors, except deliberate placeholders.
      '@typescript-eslint/no-unused-vars': [
        'error',
        { argsIgnorePattern: '^_', varsIgnorePattern: '^_', caughtErrorsIgnorePattern: '^_' },
      ],
    },
  },
  {
    // Arrows between layers point down only; the table is build/layers.mjs.
    plugins: { layers },
    rules: { 'layers/arrows': 'error' },
  },
);
