import { defineConfig } from 'vitest/config';
import react from '@vitejs/plugin-react';

// Cross-origin isolation lets onnxruntime-web use WASM threads (SharedArrayBuffer).
const isolationHeaders = {
  'Cross-Origin-Opener-Policy': 'same-origin',
  'Cross-Origin-Embedder-Policy': 'require-corp',
};

export default defineConfig({
  plugins: [react()],
  server: { headers: isolationHeaders },
  preview: { headers: isolationHeaders },
  optimizeDeps: { exclude: ['onnxruntime-web'] },
  worker: { format: 'es' },
  test: {
    projects: [
      {
        extends: true,
        test: {
          name: 'core',
          environment: 'node',
          include: [
            'src/core/**/*.test.ts',
            'src/report/**/*.test.ts',
            'src/dataset/**/*.test.ts',
            'src/phantom/**/*.test.ts',
            'src/batch/**/*.test.ts',
          ],
        },
      },
      {
        extends: true,
        test: { name: 'app', environment: 'jsdom', include: ['src/app/**/*.test.{ts,tsx}'] },
      },
      {
        extends: true,
        test: {
          name: 'inference',
          environment: 'node',
          include: ['src/model/**/*.test.ts'],
          testTimeout: 60_000,
        },
      },
      {
        extends: true,
        test: { name: 'cli', environment: 'node', include: ['tests/cli/**/*.test.ts'], testTimeout: 300_000, hookTimeout: 300_000 },
      },
      {
        extends: true,
        test: {
          name: 'e2e',
          environment: 'node',
          include: ['tests/e2e/**/*.test.ts'],
          testTimeout: 300_000,
          hookTimeout: 300_000,
          fileParallelism: false,
        },
      },
    ],
  },
});
