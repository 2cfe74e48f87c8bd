import { defineConfig } from 'vite';
import react from '@vitejs/plugin-react';
import { CONTENT_SECURITY_POLICY } from './csp.ts';

export default defineConfig({
  plugins: [react()],
  worker: { format: 'es' },
  build: { target: 'es2022', sourcemap: true },
  // A response header, not a <meta> tag: Chromium applies a meta policy to the page only,
  // and a worker loaded from a URL takes its policy from its own script's response. The
  // dev server (`vite`) injects inline scripts for React refresh, so it sends none.
  preview: { headers: { 'Content-Security-Policy': CONTENT_SECURITY_POLICY } },
});
