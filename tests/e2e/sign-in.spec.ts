import { expect, test } from '@playwright/test';
import { TRAIL, firstLink, lastMailId, people, signIn, waitForMail } from './support';

test('password sign-in lands a one-venue person in their venue', async ({ page }) => {
	await signIn(page, people.crew);
	await expect(page).toHaveURL(new RegExp(`${TRAIL}$`));
	await expect(page.getByRole('heading', { level: 1, name: 'Hollow Pines Trail' })).toBeVisible();
});

test('the session cookie is HttpOnly and SameSite, and pages carry a content security policy', async ({
	page,
	context
}) => {
	const res = await page.goto('/sign-in');
	expect(res?.headers()['content-security-policy']).toMatch(/default-src 'self'/);
	expect(res?.headers()['content-security-policy']).toMatch(/script-src 'self' 'nonce-/);
	await signIn(page, people.crew);
	const session = (await context.cookies()).find((c) => c.name.endsWith('authjs.session-token'));
	expect(session?.httpOnly).toBe(true);
	expect(session?.sameSite).toBe('Lax');
});

test('a person in several venues chooses from their list', async ({ page }) => {
	await signIn(page, people.manager);
	await expect(page).toHaveURL(/\/venues$/);
	await expect(page.getByRole('link', { name: /Hollow Pines Trail/ })).toBeVisible();
	await expect(page.getByRole('link', { name: /Night Gallery/ })).toBeVisible();
});

test('a wrong password gets a clear message and keeps the e-mail', async ({ page }) => {
	await page.goto('/sign-in');
	await page.getByLabel('E-mail', { exact: true }).fill(people.owner);
	await page.getByLabel('Password').fill('not-the-password');
	await page.getByRole('button', { name: 'Sign in with password' }).click();
	await expect(page.getByRole('alert')).toHaveText(/e-mail address and password do not match/);
	await expect(page.getByLabel('E-mail', { exact: true })).toHaveValue(people.owner);
	await expect(page).toHaveURL(/\/sign-in/);
});

test('an empty form says which fields are missing', async ({ page }) => {
	await page.goto('/sign-in');
	await page.getByRole('button', { name: 'Sign in with password' }).click();
	await expect(page.getByText('Enter your e-mail address.')).toBeVisible();
	await expect(page.getByText('Enter your password.')).toBeVisible();
});

test('repeated wrong passwords are slowed down with a clear message', async ({ page }) => {
	const email = 'nobody-at-all@gloaming.test';
	await page.goto('/sign-in');
	// Five free tries, then each waits longer: keep trying until the page says how long to wait.
	let i = 0;
	await expect(async () => {
		await page.getByLabel('E-mail', { exact: true }).fill(email);
		await page.getByLabel('Password').fill(`guess-${i++}`);
		await page.getByRole('button', { name: 'Sign in with password' }).click();
		await expect(page.getByRole('alert')).toHaveText(
			/Too many tries\. Try again in \d+ seconds?, or ask for a sign-in link by e-mail\./,
			{ timeout: 500 }
		);
	}).toPass({ intervals: [100], timeout: 20_000 });
	expect(i).toBeGreaterThan(5);
});

test('sign-in by e-mail link read from the mail catcher', async ({ page }) => {
	const since = await lastMailId();
	await page.goto('/sign-in');
	await page.getByLabel('E-mail me a sign-in link').fill(people.designer);
	await page.getByRole('button', { name: 'Send me a link' }).click();
	await expect(page.getByRole('heading', { name: 'Check your e-mail' })).toBeVisible();
	const mail = await waitForMail(people.designer, since);
	expect(mail.subject).toBe('Your Gloaming sign-in link');
	await page.goto(firstLink(mail.text));
	await expect(page).toHaveURL(/\/venues$/);
	await expect(page.getByRole('heading', { name: 'Your venues' })).toBeVisible();
});

test('signing out ends the session', async ({ page }) => {
	await signIn(page, people.crew);
	await page.getByRole('button', { name: 'Sign out' }).click();
	await expect(page).toHaveURL(/\/sign-in/);
	await page.goto(TRAIL);
	await expect(page).toHaveURL(/\/sign-in\?redirectTo=/);
});
