import { expect, test } from '@playwright/test';
import { TRAIL, people, signIn } from './support';

test('low-light mode persists in a cookie and is rendered by the server', async ({ page }) => {
	await signIn(page, people.crew);
	await expect(page.locator('html')).toHaveAttribute('data-theme', 'dusk');
	await Promise.all([
		page.waitForResponse((r) => r.url().endsWith('/theme')),
		page.getByRole('button', { name: 'Low-light' }).click()
	]);
	await expect(page.locator('html')).toHaveAttribute('data-theme', 'low-light');
	const html = await (await page.request.get(TRAIL)).text();
	expect(html).toContain('data-theme="low-light"');
	await page.reload();
	await expect(page.locator('html')).toHaveAttribute('data-theme', 'low-light');
	await expect(page.locator('body')).toHaveCSS('background-color', 'rgb(0, 0, 0)');
});

test('a room can be added, renamed and removed, and bad input is explained', async ({ page }) => {
	await signIn(page, people.designer);
	await page.goto(`${TRAIL}/rooms`);
	await page.getByRole('button', { name: 'Add room' }).click();
	await expect(page.getByText('Name the room.')).toBeVisible();
	await page.getByLabel('Name', { exact: true }).fill('Gatehouse');
	await page.getByRole('button', { name: 'Add room' }).click();
	await expect(page.getByText('This venue already has a room with that name.')).toBeVisible();
	await page.getByLabel('Name', { exact: true }).fill('Crow Loft');
	await page.getByRole('button', { name: 'Add room' }).click();
	await expect(page.getByText('Crow Loft')).toBeVisible();
	await page.getByRole('button', { name: 'Rename Crow Loft' }).click();
	const editing = page
		.getByRole('listitem')
		.filter({ has: page.getByRole('button', { name: 'Save' }) });
	await editing.getByLabel('Name').fill('Raven Loft');
	await editing.getByRole('button', { name: 'Save' }).click();
	await expect(page.getByText('Raven Loft')).toBeVisible();
	page.once('dialog', (d) => d.accept());
	await page.getByRole('button', { name: 'Remove Raven Loft' }).click();
	await expect(page.getByText('Raven Loft')).toHaveCount(0);
});

test('an owner switches the venue to the 12-hour clock and back', async ({ page }) => {
	await signIn(page, people.owner);
	const choose = async (clock: '12-hour' | '24-hour') => {
		await page.goto(`${TRAIL}/settings`);
		await page.getByLabel(clock).check();
		await page.getByRole('button', { name: 'Save settings' }).click();
		await expect(page.getByRole('status')).toHaveText('Saved.');
	};
	const crewCall = page.locator('dt', { hasText: 'Crew call' }).locator('+ dd');

	await choose('12-hour');
	await page.goto(TRAIL);
	await expect(crewCall).toHaveText(/^\d{1,2}:\d{2} (am|pm)$/);
	await page.getByRole('link', { name: /^\w{3} \d{1,2} \w{3} \d{4}$/ }).click();
	await expect(page.getByText(/crew call \d{1,2}:\d{2} (am|pm) · doors/)).toBeVisible();
	// The device's picker follows the device; the echo beside it follows the venue.
	await page.getByLabel('Doors open').fill('19:45');
	await expect(page.locator('#show-open-echo')).toHaveText(/, 7:45 pm$/);

	await choose('24-hour');
	await page.goto(TRAIL);
	await expect(crewCall).toHaveText(/^\d{2}:\d{2}$/);
});
