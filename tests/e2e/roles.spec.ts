import { expect, test } from '@playwright/test';
import { GALLERY, TRAIL, people, signIn } from './support';

test('crew cannot open owner pages', async ({ page }) => {
	await signIn(page, people.crew);
	await expect(page.getByRole('link', { name: 'Members' })).toHaveCount(0);
	for (const path of ['members', 'settings', 'activity']) {
		const res = await page.goto(`${TRAIL}/${path}`);
		expect(res?.status()).toBe(403);
		await expect(page.getByRole('heading', { name: 'Not for your role' })).toBeVisible();
	}
});

test("a member of one venue gets 404 on another venue's pages and API", async ({ page }) => {
	await signIn(page, people.crew);
	const res = await page.goto(GALLERY);
	expect(res?.status()).toBe(404);
	await expect(page.getByRole('heading', { name: 'Nothing here' })).toBeVisible();
	const api = await page.request.get(`/api${GALLERY}/rooms`);
	expect(api.status()).toBe(404);
	const own = await page.request.get(`/api${TRAIL}/rooms`);
	expect(own.status()).toBe(200);
	expect((await own.json()).rooms.map((r: { name: string }) => r.name)).toContain('Lantern Walk');
});

test("crew cannot post to an owner's form action", async ({ page, baseURL }) => {
	await signIn(page, people.crew);
	const res = await page.request.post(`${TRAIL}/members?/invite`, {
		form: { email: 'sneaky@gloaming.test', role: 'owner' },
		headers: { origin: baseURL!, 'x-sveltekit-action': 'true' }
	});
	expect(res.status()).toBe(403);
});

test('the API asks for sign-in without a session', async ({ request }) => {
	const res = await request.get(`/api${TRAIL}/rooms`);
	expect(res.status()).toBe(401);
});

test('one person, a different role in each venue', async ({ page }) => {
	await signIn(page, people.designer);
	await page.goto(TRAIL);
	await expect(page.getByText('you are Designer')).toBeVisible();
	await page.goto(GALLERY);
	await expect(page.getByText('you are Crew')).toBeVisible();
});

test('the venue switcher moves between venues and closes with Escape', async ({ page }) => {
	await signIn(page, people.manager);
	await page.getByRole('link', { name: /Hollow Pines Trail/ }).click();
	await page.getByRole('button', { name: /Hollow Pines Trail/ }).click();
	await expect(page.getByRole('link', { name: /Night Gallery/ })).toBeVisible();
	await page.keyboard.press('Escape');
	await expect(page.locator('#venue-menu')).toHaveCount(0);
	await page.getByRole('button', { name: /Hollow Pines Trail/ }).click();
	await page.getByRole('link', { name: /Night Gallery/ }).click();
	await expect(page.getByRole('heading', { level: 1, name: /Night Gallery/ })).toBeVisible();
});
