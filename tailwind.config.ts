import type { Config } from 'tailwindcss'

// Brinkwater's own palette: brine (the working blue-green), abyss (ink), dune (paper),
// flare (cautions) and samphire (all clear). Text pairs used in the UI meet WCAG AA.
export default {
  theme: {
    extend: {
      fontFamily: {
        sans: ['"Atkinson Hyperlegible"', 'system-ui', 'sans-serif'],
      },
      colors: {
        brine: {
          50: '#eef8fa', 100: '#d5eef3', 200: '#addde7', 300: '#7cc5d6', 400: '#46a6bd',
          500: '#2a8aa3', 600: '#1f6f86', 700: '#1c5a6d', 800: '#1b4a5a', 900: '#1a3e4c', 950: '#0c2630',
        },
        abyss: { 700: '#1d2f3a', 800: '#142530', 900: '#0b1a23', 950: '#061018' },
        dune: {
          50: '#faf8f3', 100: '#f2eee3', 200: '#e4dcc7', 300: '#d1c3a0', 400: '#b9a679',
          500: '#9c885a', 600: '#7b6a45', 700: '#5d5036', 800: '#3f3726', 900: '#29241a',
        },
        flare: { 50: '#fdf1ee', 100: '#fadcd5', 500: '#d9513b', 600: '#b93d2a', 700: '#9a3222', 800: '#7a281b' },
        samphire: { 50: '#eef6ef', 100: '#d6eada', 600: '#3f7d4a', 700: '#32643b', 800: '#264d2d' },
      },
    },
  },
} satisfies Partial<Config>
