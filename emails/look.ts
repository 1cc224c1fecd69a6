// How e-mails look: mail programs drop style sheets and classes, so every element carries its own
// inline style, and layout is tables. The colours are the dark theme's.

export const COLOURS = {
	ground: '#16132a',
	panel: '#211d3d',
	ink: '#ece8fa',
	muted: '#b2aad4',
	edge: '#4c457a',
	lantern: '#f2a93b',
	ember: '#f87160',
	onLantern: '#1c1408'
};

export const FONT = "'Atkinson Hyperlegible',Verdana,Arial,sans-serif";

/** Inline styles shared by the e-mail components. */
export const MAIL = {
	para: 'margin:0 0 12px;',
	muted: `margin:0;color:${COLOURS.muted};`,
	small: `margin:0;color:${COLOURS.muted};font-size:14px;`,
	heading: `margin:24px 0 8px;font-size:18px;color:${COLOURS.lantern};`,
	list: 'margin:0 0 8px;padding-left:22px;',
	item: 'margin:0 0 4px;',
	card: `margin:0 0 12px;padding:10px 12px;border:1px solid ${COLOURS.edge};border-radius:8px;`,
	warnings: `margin:0 0 8px;padding:6px 10px;list-style:none;border-left:4px solid ${COLOURS.ember};color:${COLOURS.ember};font-weight:bold;`,
	label: `padding:4px 12px 4px 0;color:${COLOURS.muted};vertical-align:top;white-space:nowrap;`,
	value: 'padding:4px 0;vertical-align:top;',
	link: `color:${COLOURS.lantern};font-weight:bold;`
};

/**
 * The attributes of one element of a template shared by a page and an e-mail: Tailwind classes on
 * the page, the inline style in the e-mail.
 */
export function look(
	mail: boolean,
	cls: string,
	style: string
): { class?: string; style?: string } {
	if (mail) return style ? { style } : {};
	return cls ? { class: cls } : {};
}
