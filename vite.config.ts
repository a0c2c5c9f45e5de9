import { fileURLToPath } from 'node:url';
import { defineConfig } from 'vite';
import react from '@vitejs/plugin-react';
import tailwindcss from '@tailwindcss/vite';

const here = (p: string) => fileURLToPath(new URL(p, import.meta.url));

// The front end lives in frontend/; the API (Express) serves the built files from dist/ in one process.
export default defineConfig({
  root: here('./frontend'),
  plugins: [react(), tailwindcss()],
  resolve: {
    alias: {
      '@': here('./frontend/src'),
      '@common': here('./common/src'),
    },
  },
  build: {
    outDir: here('./dist'),
    emptyOutDir: true,
    chunkSizeWarningLimit: 600,
  },
  server: {
    port: 5173,
    proxy: { '/api': 'http://127.0.0.1:8080' },
  },
});
