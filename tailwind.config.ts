import type { Config } from 'tailwindcss';

// Loaded from app/globals.css with @config. Colours are CSS variables so the dark and light
// themes swap in one place (app/globals.css).
const config: Config = {
  content: ['./app/**/*.{ts,tsx}', './components/**/*.{ts,tsx}'],
  darkMode: ['class', '[data-theme="dark"]'],
  theme: {
    extend: {
      colors: {
        canvas: 'rgb(var(--canvas) / <alpha-value>)',
        panel: 'rgb(var(--panel) / <alpha-value>)',
        raised: 'rgb(var(--raised) / <alpha-value>)',
        line: 'rgb(var(--line) / <alpha-value>)',
        ink: 'rgb(var(--ink) / <alpha-value>)',
        muted: 'rgb(var(--muted) / <alpha-value>)',
        beam: 'rgb(var(--beam) / <alpha-value>)',
        glow: 'rgb(var(--glow) / <alpha-value>)',
        pass: 'rgb(var(--pass) / <alpha-value>)',
        warn: 'rgb(var(--warn) / <alpha-value>)',
        fail: 'rgb(var(--fail) / <alpha-value>)',
      },
      fontFamily: {
        sans: ['var(--font-sans)', 'system-ui', 'sans-serif'],
        mono: ['var(--font-mono)', 'ui-monospace', 'monospace'],
      },
    },
  },
};

export default config;
