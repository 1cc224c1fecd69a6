import type { Transporter } from 'nodemailer';
import type { Envelope, SendFn } from './outbox';

/** A SendFn over one nodemailer transport: a fixed Message-ID and the stored attachments. */
export function envelopeSender(transport: Transporter, from: string): SendFn {
	return async (mail: Envelope) => {
		await transport.sendMail({
			from,
			to: mail.to,
			subject: mail.subject,
			html: mail.html,
			text: mail.text,
			messageId: mail.messageId,
			attachments: mail.attachments.map((a) => ({
				filename: a.filename,
				contentType: a.contentType,
				content: Buffer.from(a.content, 'base64')
			}))
		});
	};
}
