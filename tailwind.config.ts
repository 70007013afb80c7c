import type { Config } from 'tailwindcss';

/**
 * Neutral steel greys for the frame; colour only where it means something, after the
 * safety colours of ISO 3864-1: red = danger/stop/overdue, yellow = caution/due soon,
 * blue = mandatory action (PPE), green = safe condition/done.
 */
export default {
  content: ['./index.html', './src/**/*.{ts,tsx}'],
  theme: {
    extend: {
      fontFamily: {
        sans: ['"Roboto Condensed"', 'system-ui', 'sans-serif'],
      },
      colors: {
        steel: {
          50: '#f4f6f8',
          100: '#e6eaee',
          200: '#cdd4db',
          300: '#a9b4bf',
          400: '#7d8a97',
          500: '#5d6b78',
          600: '#485561',
          700: '#38434e',
          800: '#28313a',
          900: '#1e2730',
          950: '#141a20',
        },
        danger: { DEFAULT: '#b91c1c', soft: '#fde8e8', ink: '#7f1212' },
        caution: { DEFAULT: '#f2b705', soft: '#fff6d6', ink: '#5c4500' },
        mandatory: { DEFAULT: '#1d4ed8', soft: '#e3ebff', ink: '#15347f' },
        safe: { DEFAULT: '#15803d', soft: '#e3f5e9', ink: '#0d4f26' },
      },
      minHeight: { touch: '44px' },
      minWidth: { touch: '44px' },
    },
  },
} satisfies Config;
