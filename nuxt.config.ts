// Thermotome: Nuxt 4 with the source at the repository root (see DEVELOPERS.md).
export default defineNuxtConfig({
  compatibilityDate: '2025-07-15',
  // Nuxt 4 silently switches to app/ when such a folder appears; pin the root.
  srcDir: '.',
  // Keep build output inside the checkout: by default Nuxt 4 builds into
  // node_modules/.cache/nuxt, which checkouts sharing node_modules would overwrite.
  buildDir: '.nuxt',
  devtools: { enabled: false },
  telemetry: false,
  modules: ['@nuxtjs/tailwindcss', '@pinia/nuxt', 'nuxt-auth-utils'],
  css: [
    '@fontsource/atkinson-hyperlegible/400.css',
    '@fontsource/atkinson-hyperlegible/400-italic.css',
    '@fontsource/atkinson-hyperlegible/700.css',
    '~/assets/css/main.css',
  ],
  app: {
    head: {
      htmlAttrs: { lang: 'en' },
      title: 'Thermotome',
      meta: [
        { name: 'viewport', content: 'width=device-width, initial-scale=1' },
        { name: 'description', content: 'Signed notebook records of thermal-population calculations' },
      ],
    },
  },
  runtimeConfig: {
    // DATABASE_URL is read directly in server/utils/db.ts so that scripts share it.
    // Demo mode is switched on at run time with NUXT_DEMO_MODE=true and NUXT_PUBLIC_DEMO_MODE=true.
    demoMode: false,
    session: {
      maxAge: 60 * 60 * 8, // eight hours, then sign in again
      // HttpOnly always; Secure is added per request when it came over HTTPS
      // (server/plugins/cookieSecurity.ts), so plain-HTTP loopback and LAN set-ups still sign in.
      cookie: { sameSite: 'lax', httpOnly: true, secure: false },
    },
    public: {
      demoMode: false,
      // Host origins allowed to frame /embed pages, space separated (NUXT_PUBLIC_EMBED_ORIGINS).
      embedOrigins: '',
    },
  },
  // The engine uses BigInt literals for exact microstate counts: target ES2022 everywhere.
  vite: {
    build: { target: 'es2022' },
    esbuild: { target: 'es2022' },
    optimizeDeps: { esbuildOptions: { target: 'es2022' } },
  },
  nitro: {
    esbuild: { options: { target: 'es2022' } },
    serverAssets: [
      { baseName: 'fonts', dir: '../node_modules/@fontsource/atkinson-hyperlegible/files' },
      // Greek and Cyrillic fallback for record PDFs (Atkinson Hyperlegible has neither).
      { baseName: 'notoFonts', dir: '../node_modules/@fontsource/noto-sans/files', pattern: 'noto-sans-{greek,cyrillic}-{400,700}-*.woff' },
      // Japanese and Chinese: the numbered slices at the two weights the PDF uses (server/pdf/fonts.ts).
      { baseName: 'cjkFonts', dir: '../node_modules/@fontsource/noto-sans-jp/files', pattern: 'noto-sans-jp-[0-9]*-{400,700}-normal.woff' },
      { baseName: 'cjkFonts', dir: '../node_modules/@fontsource/noto-sans-sc/files', pattern: 'noto-sans-sc-[0-9]*-{400,700}-normal.woff' },
      { baseName: 'migrations', dir: './database/migrations' },
    ],
  },
  tailwindcss: { cssPath: false, viewer: false },
  typescript: { strict: true },
})
