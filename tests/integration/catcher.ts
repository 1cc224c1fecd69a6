import { spawn, type ChildProcess } from 'node:child_process';
import { LOCAL } from '../../scripts/lib/ports.mjs';

const t = LOCAL.test;
export const catcherSmtpPort = t.smtpPort;
const api = `http://127.0.0.1:${t.mailWebPort}/api/messages`;

export interface Caught {
	id: number;
	subject: string;
	envelopeTo: string[];
	text: string;
	html: string | null;
	attachments: { filename: string; contentType: string; size: number; content?: string }[];
}

/** Start the local mail catcher as a child process on the test ports; resolves once it answers. */
export async function startCatcher(): Promise<ChildProcess> {
	const child = spawn(process.execPath, ['--import', 'tsx', 'scripts/mail-catcher.ts'], {
		env: { ...process.env, SMTP_PORT: String(t.smtpPort), MAIL_WEB_PORT: String(t.mailWebPort) },
		stdio: 'ignore'
	});
	for (let i = 0; i < 300; i++) {
		if (child.exitCode !== null) throw new Error('the mail catcher exited at start');
		const ok = await fetch(api).then(
			(r) => r.ok,
			() => false
		);
		if (ok) return child;
		await new Promise((r) => setTimeout(r, 100));
	}
	child.kill();
	throw new Error('the mail catcher did not start');
}

export async function stopCatcher(child: ChildProcess) {
	if (child.exitCode !== null) return;
	await new Promise<void>((resolve) => {
		child.once('exit', () => resolve());
		child.kill('SIGTERM');
	});
}

export async function caught(to?: string): Promise<Caught[]> {
	const res = await fetch(to ? `${api}?to=${encodeURIComponent(to)}` : api);
	return (await res.json()) as Caught[];
}

export async function caughtOne(id: number): Promise<Caught> {
	return (await (await fetch(`${api}/${id}`)).json()) as Caught;
}
