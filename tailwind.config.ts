import type { Config } from 'tailwindcss'

// The Equipoise palette and type (see DEVELOPERS.md, "Look"): paper and ink,
// one teal accent, Inter for the interface, JetBrains Mono for source and numbers.
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
      colors: {
        'ink': '#1b2230',
        'ink-soft': '#5a6372',
        'paper': '#f6f4ef',
        'panel': '#ffffff',
        'line': '#dcd8ce',
        'accent': '#0e6b61',
        'accent-soft': '#d7ece8',
        'caution': '#a8550b',
        'fault': '#b3261e',
      },
      fontFamily: {
        sans: ['Inter', 'system-ui', 'sans-serif'],
        mono: ['"JetBrains Mono"', 'ui-monospace', 'monospace'],
      },
    },
  },
  plugins: [],
} satisfies Config
