import { defineConfig } from 'vitest/config';
import react from '@vitejs/plugin-react';
import tailwindcss from '@tailwindcss/vite';

const apiTarget = `http://127.0.0.1:${process.env.PORT ?? '5480'}`;

export default defineConfig({
  plugins: [react(), tailwindcss()],
  server: {
    proxy: {
      '/api': { target: apiTarget, changeOrigin: false },
      '/ws': { target: apiTarget.replace('http', 'ws'), ws: true },
    },
  },
  build: { outDir: 'dist/client', emptyOutDir: true, chunkSizeWarningLimit: 400 },
  test: {
    include: ['tests/**/*.test.ts', 'tests/**/*.test.tsx'],
    testTimeout: 60_000,
    // Browser journeys wait on pages; a loaded CI machine can take seconds per step.
    expect: { poll: { timeout: 15_000 } },
    hookTimeout: 60_000,
    pool: 'forks',
    fileParallelism: true,
  },
});
