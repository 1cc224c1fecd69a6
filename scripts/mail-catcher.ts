// The local mail catcher: an SMTP server on 127.0.0.1 that keeps every message in memory,
// with a readable inbox page and a JSON API for tests. Development and tests only.
import { createServer } from 'node:http';
import { SMTPServer } from 'smtp-server';
import { simpleParser, type ParsedMail } from 'mailparser';

const smtpPort = Number(process.env.SMTP_PORT ?? 2525);
const webPort = Number(process.env.MAIL_WEB_PORT ?? 5525);
const LIMIT = 1000;

interface StoredMessage {
	id: number;
	receivedAt: string;
	envelopeFrom: string;
	envelopeTo: string[];
	from: string;
	to: string;
	subject: string;
	text: string;
	html: string | null;
	attachments: { filename: string; contentType: string; size: number; content: string }[];
}

const messages: StoredMessage[] = [];
let nextId = 1;

function addressText(a: ParsedMail['to'] | ParsedMail['from']): string {
	if (!a) return '';
	return Array.isArray(a) ? a.map((x) => x.text).join(', ') : a.text;
}

const smtp = new SMTPServer({
	authOptional: true,
	disabledCommands: ['AUTH', 'STARTTLS'],
	logger: false,
	size: 30 * 1024 * 1024,
	onData(stream, session, callback) {
		simpleParser(stream)
			.then((mail) => {
				messages.push({
					id: nextId++,
					receivedAt: new Date().toISOString(),
					envelopeFrom: session.envelope.mailFrom ? session.envelope.mailFrom.address : '',
					envelopeTo: session.envelope.rcptTo.map((r) => r.address),
					from: addressText(mail.from),
					to: addressText(mail.to),
					subject: mail.subject ?? '',
					text: mail.text ?? '',
					html: typeof mail.html === 'string' ? mail.html : null,
					attachments: mail.attachments.map((a) => ({
						filename: a.filename ?? 'attachment',
						contentType: a.contentType,
						size: a.size,
						content: a.content.toString('base64')
					}))
				});
				if (messages.length > LIMIT) messages.shift();
				callback();
			})
			.catch((err: Error) => callback(err));
	}
});

function esc(s: string) {
	return s.replace(/[&<>"']/g, (c) => `&#${c.charCodeAt(0)};`);
}

function summary(m: StoredMessage) {
	const { attachments, ...rest } = m;
	return { ...rest, attachments: attachments.map(({ content: _c, ...a }) => a) };
}

function inboxPage(selected?: StoredMessage) {
	const rows = [...messages]
		.reverse()
		.map(
			(m) =>
				`<li><a href="/?id=${m.id}">${esc(m.subject || '(no subject)')}</a><br><small>to ${esc(m.envelopeTo.join(', '))} · ${esc(m.receivedAt)}</small></li>`
		)
		.join('');
	const body = selected
		? `<h2>${esc(selected.subject)}</h2><p><small>From ${esc(selected.from)} to ${esc(selected.to)}</small></p>
		   ${selected.html ? `<iframe title="HTML part" sandbox src="/api/messages/${selected.id}/html"></iframe>` : ''}
		   <h3>Plain text</h3><pre>${esc(selected.text)}</pre>
		   ${selected.attachments.length ? `<h3>Attachments</h3><ul>${selected.attachments.map((a, i) => `<li><a href="/api/messages/${selected.id}/attachments/${i}">${esc(a.filename)}</a> (${esc(a.contentType)}, ${a.size} bytes)</li>`).join('')}</ul>` : ''}`
		: '<p>Choose a message.</p>';
	return `<!doctype html><html lang="en"><head><meta charset="utf-8"><meta name="viewport" content="width=device-width,initial-scale=1">
<title>Local inbox</title><style>
body{font-family:system-ui,sans-serif;margin:0;display:grid;grid-template-columns:minmax(220px,1fr) 3fr;min-height:100vh;background:#16132a;color:#ece8fa}
nav{border-right:1px solid #4c457a;padding:1rem;overflow:auto}main{padding:1rem}a{color:#f2a93b}li{margin:.6rem 0}
iframe{width:100%;height:60vh;background:#fff;border:0}pre{white-space:pre-wrap}
@media (max-width:700px){body{grid-template-columns:1fr}nav{border-right:0;border-bottom:1px solid #4c457a}}
</style></head><body><nav><h1>Local inbox</h1><p><small>${messages.length} message(s). SMTP on 127.0.0.1:${smtpPort}.</small></p><ul>${rows || '<li>No mail yet.</li>'}</ul></nav><main>${body}</main></body></html>`;
}

const web = createServer((req, res) => {
	const url = new URL(req.url ?? '/', `http://127.0.0.1:${webPort}`);
	const json = (status: number, data: unknown) => {
		res.writeHead(status, { 'content-type': 'application/json' });
		res.end(JSON.stringify(data));
	};
	const parts = url.pathname.split('/').filter(Boolean);
	if (url.pathname === '/') {
		const id = Number(url.searchParams.get('id'));
		res.writeHead(200, { 'content-type': 'text/html; charset=utf-8' });
		res.end(inboxPage(messages.find((m) => m.id === id)));
		return;
	}
	if (parts[0] !== 'api' || parts[1] !== 'messages') return json(404, { error: 'not found' });
	if (parts.length === 2 && req.method === 'GET') {
		const to = url.searchParams.get('to')?.toLowerCase();
		const list = to
			? messages.filter((m) => m.envelopeTo.some((a) => a.toLowerCase() === to))
			: messages;
		return json(200, list.map(summary));
	}
	if (parts.length === 2 && req.method === 'DELETE') {
		messages.length = 0;
		return json(200, { cleared: true });
	}
	const m = messages.find((x) => x.id === Number(parts[2]));
	if (!m) return json(404, { error: 'no such message' });
	if (parts.length === 3) return json(200, m);
	if (parts[3] === 'html') {
		res.writeHead(200, { 'content-type': 'text/html; charset=utf-8' });
		res.end(m.html ?? '');
		return;
	}
	if (parts[3] === 'attachments') {
		const a = m.attachments[Number(parts[4])];
		if (!a) return json(404, { error: 'no such attachment' });
		res.writeHead(200, {
			'content-type': a.contentType,
			'content-disposition': `attachment; filename="${a.filename.replace(/"/g, '')}"`
		});
		res.end(Buffer.from(a.content, 'base64'));
		return;
	}
	json(404, { error: 'not found' });
});

smtp.listen(smtpPort, '127.0.0.1', () => {
	web.listen(webPort, '127.0.0.1', () => {
		console.log(
			`[mail] catching SMTP on 127.0.0.1:${smtpPort}; inbox at http://127.0.0.1:${webPort}/`
		);
	});
});

function shutdown() {
	web.close();
	smtp.close(() => process.exit(0));
	setTimeout(() => process.exit(0), 1000).unref();
}
process.on('SIGTERM', shutdown);
process.on('SIGINT', shutdown);
