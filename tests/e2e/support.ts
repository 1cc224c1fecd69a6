import { expect, type Page } from '@playwright/test';
import { LOCAL } from '../../scripts/lib/ports.mjs';

export const DEMO_PASSWORD = 'lantern-demo-2026';
export const people = {
	owner: 'owner@gloaming.test',
	designer: 'designer@gloaming.test',
	manager: 'manager@gloaming.test',
	crew: 'crew@gloaming.test'
} as const;
export const TRAIL = '/v/hollow-pines-trail';
export const GALLERY = '/v/marrowfield-night-gallery';

const mailApi = `http://127.0.0.1:${LOCAL.test.mailWebPort}/api/messages`;

export async function signIn(page: Page, email: string, password = DEMO_PASSWORD) {
	await page.goto('/sign-in');
	await page.getByLabel('E-mail', { exact: true }).fill(email);
	await page.getByLabel('Password').fill(password);
	await page.getByRole('button', { name: 'Sign in with password' }).click();
	await expect(page).not.toHaveURL(/\/sign-in/);
}

export interface CaughtMessage {
	id: number;
	subject: string;
	envelopeTo: string[];
	text: string;
	html: string | null;
	/** Only on a single message read with waitForMail: content is base64. */
	attachments?: { filename: string; contentType: string; size: number; content: string }[];
}

/** Wait for the newest message to an address in the local mail catcher. */
export async function waitForMail(to: string, after = 0): Promise<CaughtMessage> {
	for (let i = 0; i < 50; i++) {
		const res = await fetch(`${mailApi}?to=${encodeURIComponent(to)}`);
		const list = (await res.json()) as CaughtMessage[];
		const fresh = list.filter((m) => m.id > after);
		if (fresh.length) {
			const full = await fetch(`${mailApi}/${fresh[fresh.length - 1].id}`);
			return (await full.json()) as CaughtMessage;
		}
		await new Promise((r) => setTimeout(r, 200));
	}
	throw new Error(`no mail to ${to} arrived`);
}

export async function lastMailId(): Promise<number> {
	const list = (await (await fetch(mailApi)).json()) as CaughtMessage[];
	return list.length ? list[list.length - 1].id : 0;
}

export function firstLink(text: string): string {
	const m = text.match(/https?:\/\/\S+/);
	if (!m) throw new Error('no link in the message');
	return m[0];
}

/** Where sessions.setup.ts keeps each role's signed-in browser state. */
export function sessionFile(role: keyof typeof people): string {
	return `tests/e2e/.sessions/${role}.json`;
}
