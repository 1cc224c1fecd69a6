// Renders an e-mail component to a whole HTML document on the server. Svelte escapes every value
// the component shows, so templates never escape by hand.
import type { Component } from 'svelte';
import { render } from 'svelte/server';
import { COLOURS } from './look';

/** Svelte's hydration markers; a typed `<` is always escaped, so no comment comes from content. */
const MARKERS = /<!--[\s\S]*?-->/g;

export function renderHtml<Props extends Record<string, unknown>>(
	component: Component<Props>,
	props: Props
): string {
	const { head, body } = render(component, { props });
	return (
		'<!doctype html><html lang="en"><head><meta charset="utf-8">' +
		`<meta name="viewport" content="width=device-width">${head.replace(MARKERS, '')}</head>` +
		`<body style="margin:0;padding:0;background:${COLOURS.ground};">` +
		`${body.replace(MARKERS, '').trim()}</body></html>`
	);
}

/** Plain-text heading with an underline, for the text part. */
export function textHeading(text: string): string {
	return `${text}\n${'-'.repeat(text.length)}`;
}
