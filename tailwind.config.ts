import type { Config } from 'tailwindcss';

// Fringelog's palette: ink and paper for reading traces, a deep teal for the product's
// actions, and the two hues a quarter-wave film shows in reflected light for accents.
export default {
  content: ['./app/**/*.{ts,tsx}', './components/**/*.{ts,tsx}'],
  theme: {
    extend: {
      colors: {
        ink: { DEFAULT: '#17202b', soft: '#3b4756', faint: '#6b7785' },
        paper: { DEFAULT: '#f6f4ee', raised: '#fffdf8', sunk: '#ebe7dc', line: '#d9d3c4' },
        fringe: { DEFAULT: '#1f5f68', dark: '#163f46', light: '#d5e8e6' },
        film: { DEFAULT: '#8a3a6b', light: '#f3e2ec' },
        brass: { DEFAULT: '#b07a1e', dark: '#7d5612', light: '#f6ead2' },
        // Tolerance grades: within (leaf), near (brass), outside (alarm).
        leaf: { DEFAULT: '#2f7a4f', light: '#dcefe2' },
        alarm: { DEFAULT: '#a3302a', light: '#f8e1de' },
      },
      fontFamily: {
        sans: ['var(--font-plex-sans)', 'ui-sans-serif', 'system-ui', 'sans-serif'],
        mono: ['var(--font-plex-mono)', 'ui-monospace', 'monospace'],
      },
    },
  },
} satisfies Config;
