import type { Config } from 'tailwindcss';
import typography from '@tailwindcss/typography';
import forms from '@tailwindcss/forms';

/** Starground's look: an engineer's notebook — warm paper, dark ink, one copper accent. */
export default {
	content: ['./src/**/*.{html,js,svelte,ts}'],
	theme: {
		extend: {
			colors: {
				paper: { DEFAULT: '#f7f2e8', deep: '#efe7d6', line: '#ddd2bd' },
				ink: { DEFAULT: '#1f1d1a', soft: '#4a453d', faint: '#7a7264' },
				copper: { DEFAULT: '#b0592b', dark: '#8a4220', light: '#e9c4ab', wash: '#f6e3d6' },
				verdict: { safe: '#2f6b4f', rework: '#9a3b2e' },
				level: { note: '#3d5a80', caution: '#8a6a12', danger: '#9a2d22' }
			},
			fontFamily: {
				sans: ['"IBM Plex Sans"', 'system-ui', 'sans-serif'],
				mono: ['"IBM Plex Mono"', 'ui-monospace', 'monospace']
			}
		}
	},
	plugins: [typography, forms]
} satisfies Config;
