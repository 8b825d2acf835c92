import { defineConfig } from 'vite';
import { svelte } from '@sveltejs/vite-plugin-svelte';

// The renderer is served from files (Electron) and from the loopback host, so every asset path is relative.
export default defineConfig({
  root: 'src-renderer',
  base: './',
  plugins: [svelte()],
  build: {
    outDir: '../dist/renderer',
    emptyOutDir: true,
    target: 'es2022',
    chunkSizeWarningLimit: 2048,
  },
});
