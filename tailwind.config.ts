import type { Config } from 'tailwindcss';

/**
 * Halfmark's theme: a dark "ink" for structure, a warm "temper" accent taken from the colours
 * steel runs through as it heats, and signal tones that never carry meaning alone (every state
 * also has a word and a shape).
 */
export default {
  content: ['./index.html', './src/**/*.{ts,tsx}'],
  theme: {
    extend: {
      colors: {
        ink: {
          50: '#f4f6f8', 100: '#e6eaef', 200: '#cdd5de', 300: '#a7b4c3', 400: '#7a8ba0',
          500: '#5a6c82', 600: '#45556a', 700: '#364355', 800: '#243040', 900: '#161e29', 950: '#0d131b',
        },
        temper: {
          50: '#fdf6ee', 100: '#f9e7d2', 200: '#f2cba1', 300: '#e9a96b', 400: '#df8a43',
          500: '#c96f2a', 600: '#a85722', 700: '#86431f', 800: '#6c371e', 900: '#592f1c',
        },
        straw: { 100: '#fbf3d5', 500: '#c9a227', 700: '#7d6415' },
        good: { 100: '#dcf2e6', 500: '#2f8a5b', 700: '#1d5c3c' },
        warn: { 100: '#fdecc8', 500: '#b7791f', 700: '#7a4f10' },
        stop: { 100: '#fbdcdc', 500: '#c23b3b', 700: '#8a2323' },
      },
      fontFamily: {
        sans: ['"Inter"', 'system-ui', 'sans-serif'],
        mono: ['"JetBrains Mono"', 'ui-monospace', 'monospace'],
      },
      fontSize: {
        // A type scale tuned for reading at arm's length on a phone at the bench.
        caption: ['0.75rem', { lineHeight: '1rem' }],
        body: ['0.9375rem', { lineHeight: '1.4rem' }],
        lead: ['1.125rem', { lineHeight: '1.6rem' }],
        title: ['1.5rem', { lineHeight: '2rem', fontWeight: '600' }],
        display: ['2.25rem', { lineHeight: '2.5rem', fontWeight: '700' }],
      },
      borderRadius: { card: '0.625rem' },
    },
  },
} satisfies Config;
