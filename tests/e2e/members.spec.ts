import { expect, test } from '@playwright/test';
import { GALLERY, firstLink, lastMailId, people, signIn, waitForMail } from './support';

test('an owner invites a new person, who accepts by setting a password', async ({
	page,
	browser
}) => {
	const invitee = `new-crew-${Date.now()}@gloaming.test`;
	await signIn(page, people.owner);
	await page.goto(`${GALLERY}/members`);
	const since = await lastMailId();
	await page.getByLabel('E-mail').fill(invitee);
	await page.getByLabel('Role', { exact: true }).selectOption('crew');
	await page.getByRole('button', { name: 'Send invitation' }).click();
	await expect(page.getByRole('status')).toHaveText(`Invitation sent to ${invitee}.`);
	await expect(
		page.getByRole('region', { name: 'Open invitations' }).getByText(invitee)
	).toBeVisible();

	const mail = await waitForMail(invitee, since);
	expect(mail.subject).toContain('Marrowfield Science Centre: Night Gallery');
	const context = await browser.newContext();
	const guest = await context.newPage();
	await guest.goto(firstLink(mail.text));
	await expect(guest.getByText('as Crew')).toBeVisible();
	await guest.getByLabel('Your name').fill('Wil Harrow');
	await guest.getByLabel('Choose a password').fill('short');
	await guest.getByLabel('Type it again').fill('short');
	await guest.getByRole('button', { name: /Join/ }).click();
	await expect(guest.getByText('Use at least 10 characters.')).toBeVisible();
	await expect(guest.getByLabel('Your name')).toHaveValue('Wil Harrow');
	await guest.getByLabel('Choose a password').fill('a-long-enough-password');
	await guest.getByLabel('Type it again').fill('a-long-enough-password');
	await guest.getByRole('button', { name: /Join/ }).click();
	await expect(guest).toHaveURL(new RegExp(`${GALLERY}$`));
	await expect(guest.getByText('you are Crew')).toBeVisible();

	// The link works once.
	await guest.goto(firstLink(mail.text));
	await expect(guest.getByRole('alert')).toHaveText(/already been accepted/);
	await context.close();

	await page.reload();
	await expect(page.getByText('Wil Harrow')).toBeVisible();
});

test('the last owner cannot be demoted', async ({ page }) => {
	await signIn(page, people.owner);
	await page.goto(`${GALLERY}/members`);
	const me = page.getByRole('listitem').filter({ hasText: '(you)' });
	await me.getByRole('combobox').selectOption('crew');
	await me.getByRole('button', { name: 'Save role' }).click();
	await expect(page.getByRole('alert')).toHaveText(/at least one owner/);
});

test('a bad invitation link says so', async ({ page }) => {
	await page.goto('/invitations/not-a-real-token');
	await expect(page.getByRole('alert')).toHaveText(/not valid/);
});
