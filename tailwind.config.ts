import type { Config } from 'tailwindcss';

// Lumenproof's own palette: a deep lagoon teal for action, warm slate-green neutrals for text and surfaces,
// and signal colours that keep AA contrast on white at their 700 shade.
export default {
  content: ['./index.html', './src/**/*.{ts,tsx}'],
  theme: {
    extend: {
      colors: {
        ink: {
          50: '#f5f7f6', 100: '#e9eeec', 200: '#d5ddda', 300: '#b5c2bd', 400: '#8a9b95',
          500: '#687b74', 600: '#52635d', 700: '#424f4b', 800: '#2e3835', 900: '#1b2320', 950: '#0e1412',
        },
        brand: {
          50: '#eefbf8', 100: '#d3f3ec', 200: '#a9e6da', 300: '#72d1c2', 400: '#3fb4a5',
          500: '#23998b', 600: '#167b71', 700: '#0d5c57', 800: '#0c4a46', 900: '#0b3d3a', 950: '#042321',
        },
        ok: { 50: '#effaf1', 100: '#d8f2de', 200: '#b2e4bf', 300: '#7fcf97', 400: '#4bb36d', 500: '#2d9652', 600: '#1f7a41', 700: '#1a6136', 800: '#184d2e', 900: '#143f27' },
        warn: { 50: '#fff8eb', 100: '#feecc6', 200: '#fdd688', 300: '#fbbb4b', 400: '#f9a124', 500: '#e57f0b', 600: '#c25e06', 700: '#9c4309', 800: '#7e350e', 900: '#682d0f' },
        bad: { 50: '#fef3f2', 100: '#fde4e1', 200: '#fbcdc8', 300: '#f7aaa1', 400: '#f0786b', 500: '#e44f3f', 600: '#cf3323', 700: '#ad281a', 800: '#8f2519', 900: '#77251b' },
        info: { 50: '#f0f6fe', 100: '#dde9fc', 200: '#c3dafa', 300: '#9ac3f6', 400: '#6aa2f0', 500: '#4781ea', 600: '#3164de', 700: '#2850c9', 800: '#2742a3', 900: '#253b81' },
      },
      fontFamily: {
        sans: ['"Inter Variable"', 'ui-sans-serif', 'system-ui', 'sans-serif'],
      },
      fontSize: {
        '2xs': ['0.6875rem', { lineHeight: '1rem' }],
      },
      borderRadius: { card: '0.75rem' },
      boxShadow: { card: '0 1px 2px rgb(14 20 18 / 0.06), 0 1px 3px rgb(14 20 18 / 0.08)' },
    },
  },
} satisfies Config;
