// Shared frame for Gloaming e-mails: inline styles and tables only, which survive common mail clients.
export function escapeHtml(s: string): string {
	return s.replace(/[&<>"']/g, (c) => `&#${c.charCodeAt(0)};`);
}

export function frame(title: string, bodyHtml: string): string {
	return `<!doctype html><html lang="en"><head><meta charset="utf-8"><meta name="viewport" content="width=device-width"><title>${escapeHtml(title)}</title></head>
<body style="margin:0;padding:0;background:#16132a;">
<table role="presentation" width="100%" cellpadding="0" cellspacing="0" style="background:#16132a;"><tr><td align="center" style="padding:24px 12px;">
<table role="presentation" width="100%" cellpadding="0" cellspacing="0" style="max-width:560px;background:#211d3d;border:1px solid #4c457a;border-radius:12px;">
<tr><td style="padding:20px 24px;font-family:'Atkinson Hyperlegible',Verdana,Arial,sans-serif;color:#ece8fa;font-size:16px;line-height:1.5;">
<p style="margin:0 0 16px;font-weight:bold;color:#f2a93b;letter-spacing:.04em;">GLOAMING</p>
${bodyHtml}
</td></tr></table></td></tr></table></body></html>`;
}

export function button(href: string, label: string): string {
	return `<p style="margin:24px 0;"><a href="${escapeHtml(href)}" style="display:inline-block;background:#f2a93b;color:#1c1408;font-weight:bold;text-decoration:none;padding:12px 20px;border-radius:8px;">${escapeHtml(label)}</a></p>`;
}

export const COLOURS = {
	ink: '#ece8fa',
	muted: '#b2aad4',
	edge: '#4c457a',
	lantern: '#f2a93b',
	ember: '#f87160'
};

export function heading(text: string): string {
	return `<h2 style="margin:24px 0 8px;font-size:18px;color:${COLOURS.lantern};">${escapeHtml(text)}</h2>`;
}

/** Label/value rows as a table; values are plain text. */
export function facts(rows: [string, string][]): string {
	const cells = rows
		.map(
			([k, v]) =>
				`<tr><td style="padding:4px 12px 4px 0;color:${COLOURS.muted};vertical-align:top;white-space:nowrap;">${escapeHtml(k)}</td><td style="padding:4px 0;font-weight:bold;vertical-align:top;">${escapeHtml(v)}</td></tr>`
		)
		.join('');
	return `<table role="presentation" cellpadding="0" cellspacing="0" style="border-collapse:collapse;">${cells}</table>`;
}

export function list(items: string[], ordered = false): string {
	const tag = ordered ? 'ol' : 'ul';
	return `<${tag} style="margin:0 0 8px;padding-left:22px;">${items.map((i) => `<li style="margin:0 0 4px;">${escapeHtml(i)}</li>`).join('')}</${tag}>`;
}

/** Plain-text heading with an underline, for the text part. */
export function textHeading(text: string): string {
	return `${text}\n${'-'.repeat(text.length)}`;
}
