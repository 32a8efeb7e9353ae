import type { Config } from 'tailwindcss'

/**
 * Chargewell's palette: a deep petrol "ink" for structure, a warm "paper" ground that stays
 * readable in sunlight, "signal" amber reserved for cautions, and plain words beside every
 * colour so no state is told by colour alone.
 */
export default <Partial<Config>>{
  content: [
    './components/**/*.{vue,ts}',
    './layouts/**/*.vue',
    './pages/**/*.vue',
    './app.vue',
    './error.vue',
  ],
  theme: {
    extend: {
      colors: {
        ink: { 50: '#eef5f6', 100: '#d5e6e9', 200: '#a9cdd3', 300: '#74aeb8', 400: '#3f8b98', 500: '#1f6f7d', 600: '#165a67', 700: '#124854', 800: '#0f3b46', 900: '#0a2830' },
        paper: { DEFAULT: '#f7f5f0', deep: '#ece8de' },
        signal: { 100: '#fff1cc', 300: '#ffd166', 500: '#e9a400', 700: '#8a5a00' },
        fault: { 100: '#fde4e1', 500: '#c2271d', 700: '#8c1a13' },
        sound: { 100: '#dcf2e4', 500: '#1d7f4a', 700: '#135a34' },
      },
      fontFamily: {
        sans: ['"Source Sans 3"', 'system-ui', 'sans-serif'],
      },
      minHeight: { touch: '3.25rem' },
      minWidth: { touch: '3.25rem' },
    },
  },
}
