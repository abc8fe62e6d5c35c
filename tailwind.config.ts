import type { Config } from 'tailwindcss'

// Thermotome's own small design system: a warm paper sheet, ink text, and one colour per
// record state (always shown with a word beside it). See "Look and words" in DESIGN.md.
export default <Partial<Config>>{
  content: [
    './components/**/*.{vue,ts}',
    './pages/**/*.vue',
    './layouts/**/*.vue',
    './app.vue',
    './error.vue',
    './composables/**/*.ts',
  ],
  theme: {
    extend: {
      colors: {
        paper: { DEFAULT: '#fbf8f1', deep: '#f3eee2', edge: '#e2dccb' },
        ink: { DEFAULT: '#1f1d1a', soft: '#4a463f', faint: '#6b6559' },
        desk: '#e9e5db',
        state: {
          draft: '#6b6b6b',
          awaiting: '#a86a00',
          witnessed: '#1d5e3a',
          declined: '#9c3a25',
          superseded: '#8f8a80',
        },
        focus: '#2456a6',
        link: '#2a4f8f',
      },
      fontFamily: {
        sans: ['"Atkinson Hyperlegible"', 'system-ui', 'sans-serif'],
      },
      fontSize: {
        // a modest type scale (1.2 ratio) for a readable column
        xs: ['0.8125rem', '1.2rem'],
        sm: ['0.9rem', '1.35rem'],
        base: ['1rem', '1.6rem'],
        lg: ['1.2rem', '1.75rem'],
        xl: ['1.44rem', '1.9rem'],
        '2xl': ['1.73rem', '2.2rem'],
      },
      maxWidth: { sheet: '46rem' },
      spacing: { gutter: '1.5rem' },
      boxShadow: { sheet: '0 1px 2px rgba(31,29,26,0.08), 0 4px 16px rgba(31,29,26,0.06)' },
    },
  },
}
