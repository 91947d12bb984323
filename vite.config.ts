import { defineConfig } from 'vite';

// The app is static: `vite build` writes dist/, `vite preview` serves it. No request leaves the page's origin.
export default defineConfig({
  base: './',
  build: {
    outDir: 'dist',
    target: 'es2022',
    sourcemap: false,
    reportCompressedSize: true,
  },
  server: { host: '127.0.0.1' },
  preview: { host: '127.0.0.1', port: 4173 },
});
