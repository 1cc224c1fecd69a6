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
