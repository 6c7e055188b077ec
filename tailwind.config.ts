import type { Config } from 'tailwindcss';

// Lashline's own palette. The three state colours differ in lightness as well as hue
// (dark red, mid green, light amber), so they stay apart in greyscale.
export default {
  content: ['./index.html', './src/**/*.{ts,tsx}'],
  theme: {
    extend: {
      colors: {
        ink: { DEFAULT: '#1d2733', soft: '#3c4856', muted: '#5b6673', line: '#c9c2b6' },
        paper: { DEFAULT: '#f6f2ea', raised: '#fffdf8', sunk: '#ebe5d9' },
        accent: { DEFAULT: '#2c47b0', strong: '#1f3590', soft: '#dfe5fa' },
        state: {
          ok: '#3f8f5c',
          'ok-soft': '#dcefe2',
          soon: '#efb23a',
          'soon-soft': '#fbefd2',
          stop: '#8c1c1c',
          'stop-soft': '#f6dcdc',
        },
      },
      fontFamily: {
        sans: ['"Roboto Flex Variable"', 'system-ui', 'sans-serif'],
      },
      fontSize: {
        // A scale of our own: readable at arm's length on a bench tablet.
        'reading': ['1.375rem', { lineHeight: '1.75rem' }],
        'display': ['2rem', { lineHeight: '2.4rem' }],
      },
      spacing: { tap: '2.75rem' },
      borderRadius: { card: '0.625rem' },
    },
  },
} satisfies Config;
