import { expect, test } from '@playwright/test';
import { TRAIL, firstLink, lastMailId, people, signIn, waitForMail } from './support';

test('an invitation goes through the queue, shows as sent in the mail log, and can be sent again', async ({
	page
}) => {
	test.setTimeout(60_000);
	const invitee = `queued-${Date.now()}@gloaming.test`;
	await signIn(page, people.owner);
	await page.goto(`${TRAIL}/members`);
	const since = await lastMailId();
	await page.getByLabel('E-mail').fill(invitee);
	await page.getByLabel('Role', { exact: true }).selectOption('crew');
	await page.getByRole('button', { name: 'Send invitation' }).click();
	await expect(page.getByRole('status')).toContainText(invitee);
	const first = await waitForMail(invitee, since);

	const nav = page.getByRole('navigation', { name: 'Venue' });
	await nav.getByRole('button', { name: 'More' }).click();
	await nav.getByRole('link', { name: 'Mail log' }).click();
	await expect(page.getByRole('heading', { name: 'Mail log' })).toBeVisible();
	const rows = page.getByRole('listitem').filter({ hasText: invitee });
	await expect(rows).toHaveCount(1);
	await expect(rows.first().getByTestId('mail-status')).toHaveText('Sent', { timeout: 15_000 });
	await expect(rows.first()).toContainText('Invitation to');

	await rows
		.first()
		.getByRole('button', { name: /Send again/ })
		.click();
	await expect(page.getByRole('status')).toHaveText(`Queued again for ${invitee}.`);
	const second = await waitForMail(invitee, first.id);
	await expect(rows).toHaveCount(2);
	await expect(rows.getByTestId('mail-status')).toHaveText(['Sent', 'Sent'], { timeout: 15_000 });
	await expect(rows.first()).toContainText('re-sent');
	// The re-sent invitation carries a fresh link; the old one no longer works.
	expect(firstLink(second.text)).not.toBe(firstLink(first.text));
	await page.goto(firstLink(first.text));
	await expect(page.getByRole('alert')).toHaveText(/not valid/);

	await page.goto(`${TRAIL}/activity`);
	await expect(
		page.getByText(new RegExp(`sent “You are invited to .*” to ${invitee} again`)).first()
	).toBeVisible();
});

test('a show manager sees the mail log; crew and designers do not', async ({ page, context }) => {
	await signIn(page, people.manager);
	await page.goto(`${TRAIL}/mail`);
	await expect(page.getByRole('heading', { name: 'Mail log' })).toBeVisible();
	await expect(page.getByRole('link', { name: 'Preview templates' })).toHaveCount(0);
	// Invitations are the owner's: a show manager sees them but cannot send them again.
	await expect(page.getByText(/^Invitation to /).first()).toBeVisible();
	await expect(page.getByRole('button', { name: /Send again/ })).toHaveCount(0);
	const preview = await page.request.get(`${TRAIL}/mail/preview`);
	expect(preview.status()).toBe(403);
	await context.clearCookies();
	await signIn(page, people.crew);
	const res = await page.request.get(`${TRAIL}/mail`);
	expect(res.status()).toBe(403);
	await expect(page.getByRole('link', { name: 'Mail log' })).toHaveCount(0);
});

test('sending again a message that does not exist is explained, not a crash', async ({
	page,
	baseURL
}) => {
	await signIn(page, people.owner);
	for (const id of ['not-a-uuid', '00000000-0000-4000-8000-000000000000']) {
		const res = await page.request.post(`${TRAIL}/mail?/resend`, {
			form: { id },
			headers: { origin: baseURL!, accept: 'application/json' }
		});
		expect(res.status()).toBe(200);
		const body = await res.json();
		expect(body.type).toBe('failure');
		expect(body.status).toBe(400);
	}
});

test('an owner previews every template, HTML beside plain text', async ({ page }) => {
	await signIn(page, people.owner);
	await page.goto(`${TRAIL}/mail`);
	await page.getByRole('link', { name: 'Preview templates' }).click();
	await expect(page.getByRole('heading', { name: 'E-mail templates' })).toBeVisible();
	for (const label of ['Sign-in link', 'Invitation', 'Run sheet', 'Schedule change'])
		await expect(page.getByRole('heading', { name: label, exact: true })).toBeVisible();
	const runSheet = page.frameLocator('iframe[title="Run sheet: HTML part"]');
	await expect(runSheet.getByRole('heading', { name: 'Show stop' })).toBeVisible();
	await expect(runSheet.getByText('Stood down tonight: Root hand plate')).toBeVisible();
	await expect(page.locator('#run-sheet pre')).toContainText(
		'[ ] Root Cellar: Fog fluid above the line'
	);
});
