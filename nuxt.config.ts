// Tautline: Nuxt 4 with the source folders at the project root (see DEVELOPERS.md).
export default defineNuxtConfig({
  modules: ['@pinia/nuxt', '@nuxtjs/tailwindcss', 'nuxt-auth-utils', '@nuxt/eslint'],
  imports: { dirs: ['stores'] },
  devtools: { enabled: false },
  app: {
    head: {
      htmlAttrs: { lang: 'en' },
      title: 'Tautline',
      meta: [
        { name: 'viewport', content: 'width=device-width, initial-scale=1, viewport-fit=cover' },
        { name: 'theme-color', content: '#1d3b36' },
        { name: 'description', content: 'Cord-safety register for window coverings' },
      ],
      link: [{ rel: 'icon', type: 'image/svg+xml', href: '/favicon.svg' }],
    },
  },
  css: [
    '@fontsource/public-sans/400.css',
    '@fontsource/public-sans/600.css',
    '@fontsource/public-sans/700.css',
    '~/assets/css/main.css',
  ],
  runtimeConfig: {
    session: { maxAge: 60 * 60 * 12, cookie: { sameSite: 'lax', httpOnly: true } },
  },
  srcDir: '.',
  compatibilityDate: '2026-11-01',
  nitro: { compressPublicAssets: false },
  vite: { build: { sourcemap: false } },
  typescript: { strict: true, typeCheck: false },
  telemetry: false,
  eslint: { config: { stylistic: { quotes: 'single', semi: false, commaDangle: 'always-multiline' } } },
  tailwindcss: { cssPath: false, configPath: 'tailwind.config.ts', viewer: false },
})
