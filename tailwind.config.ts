import type { Config } from 'tailwindcss'

// Design tokens: a deep spruce green for the brand, warm paper neutrals, and verdict colours
// chosen for contrast on white (each verdict also carries a word and an icon, never colour alone).
export default {
  content: [
    './components/**/*.{vue,ts}',
    './layouts/**/*.vue',
    './pages/**/*.vue',
    './composables/**/*.ts',
    './app.vue',
    './error.vue',
  ],
  theme: {
    extend: {
      fontFamily: {
        sans: ['"Public Sans"', 'system-ui', 'sans-serif'],
      },
      colors: {
        spruce: {
          50: '#eef6f4', 100: '#d5e9e4', 200: '#abd3c9', 300: '#78b5a7', 400: '#4a9383',
          500: '#2f7767', 600: '#235f53', 700: '#1d4c44', 800: '#1d3b36', 900: '#142a26',
        },
        paper: { 50: '#fbfaf7', 100: '#f4f2ec', 200: '#e7e3d9', 300: '#d4cec0', 400: '#a9a292', 500: '#7b7566', 600: '#5c574b', 700: '#433f36', 800: '#2d2a24', 900: '#1b1915' },
        safe: { 50: '#ecf7ef', 600: '#1f7a3e', 700: '#17602f' },
        hazard: { 50: '#fdeeec', 600: '#b3261e', 700: '#8f1d17' },
        unknown: { 50: '#fdf5e3', 600: '#8a5a00', 700: '#6e4800' },
        muted: { 50: '#f0f1f3', 600: '#4b5563', 700: '#374151' },
        signal: { 400: '#f2b632', 500: '#e09b12' },
      },
      spacing: { tap: '2.75rem' },
      borderRadius: { card: '0.625rem' },
      boxShadow: { card: '0 1px 2px rgba(27,25,21,0.06), 0 1px 8px rgba(27,25,21,0.04)' },
      fontSize: { label: ['0.75rem', { lineHeight: '1rem', letterSpacing: '0.04em' }] },
    },
  },
  plugins: [],
} satisfies Config
