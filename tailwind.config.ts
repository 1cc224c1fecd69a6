import type { Config } from 'tailwindcss';

// Gloaming's dusk palette. Colours are CSS variables so the low-light mode (dim red on black)
// swaps the whole theme from one place: src/app.css.
const v = (name: string) => `rgb(var(--${name}) / <alpha-value>)`;

export default {
	content: ['./src/**/*.{html,js,svelte,ts}'],
	theme: {
		extend: {
			colors: {
				ground: v('ground'),
				panel: v('panel'),
				raised: v('raised'),
				edge: v('edge'),
				ink: v('ink'),
				muted: v('muted'),
				lantern: v('lantern'),
				'lantern-ink': v('lantern-ink'),
				ember: v('ember'),
				moss: v('moss')
			},
			fontFamily: {
				sans: ['"Atkinson Hyperlegible"', 'system-ui', 'sans-serif']
			}
		}
	}
} satisfies Config;
