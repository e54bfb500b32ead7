import type { Config } from 'tailwindcss';

// One accent colour of our own (a deep teal-green ink), paper background, dark ink.
const config: Config = {
  content: ['./app/**/*.{ts,tsx}', './components/**/*.{ts,tsx}', './editor/**/*.{ts,tsx}'],
  theme: {
    extend: {
      colors: {
        paper: '#fbfaf6',
        ink: { DEFAULT: '#1d1b18', soft: '#4a4640', faint: '#8a857c' },
        rule: '#e4e0d6',
        accent: { DEFAULT: '#1f5f5b', soft: '#d9e9e6', strong: '#143f3c' },
        verdict: { holds: '#2f6b2f', fails: '#9c2f23', unsure: '#8a6a12', invalid: '#5b4a7a' },
      },
      fontFamily: {
        serif: ['"EB Garamond"', 'Georgia', 'serif'],
        mono: ['"JetBrains Mono"', 'ui-monospace', 'monospace'],
      },
    },
  },
};
export default config;
