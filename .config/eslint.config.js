// Flat config kept in a dot-folder so the repository's top level stays as the design card lists.
import tseslint from 'typescript-eslint';

const nodeBuiltins = ['node:*', 'fs', 'path', 'os', 'crypto', 'child_process', 'worker_threads', 'zlib', 'url'];

export default tseslint.config(
  { ignores: ['node_modules/**', 'dist/**', 'models/**', 'samples/**', 'tests/fixtures/**'] },
  ...tseslint.configs.recommended,
  {
    files: ['src/**/*.{ts,tsx}', 'tests/**/*.ts'],
    rules: {
      '@typescript-eslint/no-unused-vars': ['error', { argsIgnorePattern: '^_', varsIgnorePattern: '^_' }],
      '@typescript-eslint/no-explicit-any': 'error',
    },
  },
  {
    // The core is pure: typed arrays in, plain objects out.
    files: ['src/core/**/*.ts'],
    rules: {
      'no-restricted-imports': ['error', {
        patterns: [
          { group: ['**/app/**', '**/model/**', '**/dataset/**', '**/report/**', '**/batch/**', '**/cli/**', '**/phantom/**'], message: 'src/core may not import an upper layer.' },
          { group: ['react', 'react-dom', 'konva', 'react-konva', 'onnxruntime-*', 'onnxruntime-web', 'onnxruntime-node', '@huggingface/*', ...nodeBuiltins], message: 'src/core is pure: no DOM, runtime or node:* imports.' },
        ],
      }],
    },
  },
  {
    files: ['src/report/**/*.ts', 'src/dataset/**/*.ts'],
    rules: {
      'no-restricted-imports': ['error', {
        patterns: [
          { group: ['**/app/**', '**/batch/**', '**/cli/**', '**/phantom/**', '**/model/**'], message: 'report and dataset sit below batch, cli and app.' },
          { group: ['react', 'react-dom', 'konva', 'react-konva', 'onnxruntime-*', '@huggingface/*'], message: 'Only inference adapters import onnxruntime or transformers.js.' },
        ],
      }],
    },
  },
  {
    files: ['src/model/**/*.ts'],
    ignores: ['src/model/adapters/**'],
    rules: {
      'no-restricted-imports': ['error', {
        patterns: [
          { group: ['**/app/**', '**/batch/**', '**/cli/**'], message: 'model sits below batch, cli and app.' },
          { group: ['onnxruntime-*', 'onnxruntime-web', 'onnxruntime-node', '@huggingface/*'], message: 'Only src/model/adapters imports onnxruntime or transformers.js.' },
        ],
      }],
    },
  },
  {
    files: ['src/batch/**/*.ts'],
    rules: {
      'no-restricted-imports': ['error', {
        patterns: [
          { group: ['**/app/**', '**/cli/**'], message: 'batch sits below cli and app.' },
          { group: ['onnxruntime-*', '@huggingface/*', ...nodeBuiltins], message: 'batch is shared by browser and CLI: no runtime or node:* imports.' },
        ],
      }],
    },
  },
  {
    files: ['src/app/**/*.{ts,tsx}'],
    rules: {
      'no-restricted-imports': ['error', {
        patterns: [
          { group: ['**/cli/**', '**/model/adapters/ort-node*', '**/model/adapters/*-node*', 'onnxruntime-node', ...nodeBuiltins], message: 'The app may not import Node-only code.' },
        ],
      }],
    },
  },
);
