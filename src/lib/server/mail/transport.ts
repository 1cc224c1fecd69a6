import nodemailer, { type Transporter } from 'nodemailer';
import { config } from '../config';
import { envelopeSender } from './envelope';
import type { Envelope } from './outbox';

let transporter: Transporter | null = null;

/** One SMTP transport per process, configured from the environment. */
export function mailTransport(): Transporter {
	if (!transporter) {
		const { host, port, secure, user, password } = config.smtp;
		transporter = nodemailer.createTransport({
			host,
			port,
			secure,
			// Only send credentials when there are some: the local catcher offers no AUTH.
			...(user ? { auth: { user, pass: password } } : {}),
			connectionTimeout: 10_000
		});
	}
	return transporter;
}

export interface RenderedMail {
	subject: string;
	html: string;
	text: string;
}

export async function sendMail(to: string, mail: RenderedMail) {
	await mailTransport().sendMail({
		from: config.mailFrom,
		to,
		subject: mail.subject,
		html: mail.html,
		text: mail.text
	});
}

/** Send one queued message (see queue.ts): a fixed Message-ID and any attachments. */
export function sendEnvelope(mail: Envelope) {
	return envelopeSender(mailTransport(), config.mailFrom)(mail);
}

/** The domain part of the sender address, for Message-IDs. */
export function mailDomain() {
	return /@([^>\s]+)/.exec(config.mailFrom)?.[1] ?? 'gloaming.mail';
}
