// @ts-check
import withNuxt from './.nuxt/eslint.config.mjs'

/**
 * Lines a reader takes in at a glance; a message in words may run on (strings and templates are not broken mid-
 * sentence).
 */
const lineLength = {
  code: 120,
  tabWidth: 2,
  ignoreUrls: true,
  ignoreStrings: true,
  ignoreTemplateLiterals: true,
  ignoreRegExpLiterals: true,
}

export default withNuxt(
  { rules: { '@stylistic/max-len': ['error', lineLength] } },
  {
    files: ['**/*.vue'],
    rules: {
      '@stylistic/max-len': 'off',
      'vue/max-len': [
        'error',
        { ...lineLength, template: 120, ignoreHTMLAttributeValues: false, ignoreHTMLTextContents: false },
      ],
    },
  },
  {
    // The browser's requests go through the composables of their domain (DEVELOPERS.md, "The browser side").
    files: ['pages/**/*.vue', 'components/**/*.vue', 'layouts/**/*.vue'],
    rules: {
      'no-restricted-globals': ['error', ...['$fetch', 'useFetch', 'useLazyFetch', 'useAsyncData'].map(name => ({
        name,
        message: 'Ask the composable of this domain (composables/use<Domain>.ts); pages and components do not fetch.',
      }))],
    },
  },
)
