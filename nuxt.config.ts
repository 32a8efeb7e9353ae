// https://nuxt.com/docs/api/configuration/nuxt-config
export default defineNuxtConfig({
  compatibilityDate: '2025-07-15',
  // The repo root is the source root (no app/ folder); see DEVELOPERS.md.
  srcDir: '.',
  modules: ['@pinia/nuxt', '@nuxtjs/tailwindcss', 'nuxt-auth-utils', '@nuxt/eslint'],
  devtools: { enabled: false },
  telemetry: false,
})
