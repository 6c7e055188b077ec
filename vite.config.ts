import { defineConfig } from 'vite';
import react from '@vitejs/plugin-react';
import tailwindcss from '@tailwindcss/vite';
import { VitePWA } from 'vite-plugin-pwa';

export default defineConfig({
  plugins: [
    react(),
    tailwindcss(),
    // The installable shell: the service worker precaches the client, its fonts and icons, so a
    // tablet that loses the wi-fi still opens Lashline. A new version waits for the person to take
    // it (see src/components/ui/update-offer.tsx); nothing reloads under an open card.
    VitePWA({
      registerType: 'prompt',
      injectRegister: false,
      includeAssets: ['favicon.svg', 'icons/apple-touch-icon.png'],
      manifest: {
        id: '/',
        name: 'Lashline',
        short_name: 'Lashline',
        description: 'Service planning, check-ins and valve work for a motorcycle fleet.',
        lang: 'en-GB',
        start_url: '/',
        scope: '/',
        display: 'standalone',
        orientation: 'any',
        theme_color: '#1d2733',
        background_color: '#f6f2ea',
        icons: [
          { src: '/icons/icon-192.png', sizes: '192x192', type: 'image/png', purpose: 'any' },
          { src: '/icons/icon-512.png', sizes: '512x512', type: 'image/png', purpose: 'any' },
          { src: '/icons/maskable-512.png', sizes: '512x512', type: 'image/png', purpose: 'maskable' },
        ],
      },
      workbox: {
        // The Latin subsets of the font are what the product's words use; the others load if ever needed.
        globPatterns: ['**/*.{js,css,html,svg,png,webmanifest}', 'assets/roboto-flex-latin-*.woff2'],
        navigateFallback: '/index.html',
        navigateFallbackDenylist: [/^\/api\//],
        cleanupOutdatedCaches: true,
        maximumFileSizeToCacheInBytes: 3 * 1024 * 1024,
      },
    }),
  ],
  // Each build names itself, so answers a tablet kept from an older client are not shown by a newer one.
  define: { __LASHLINE_BUILD__: JSON.stringify(new Date().toISOString()) },
  build: { outDir: 'dist', sourcemap: false, chunkSizeWarningLimit: 400 },
});
