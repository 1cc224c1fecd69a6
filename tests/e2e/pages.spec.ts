import AxeBuilder from '@axe-core/playwright';
import { expect, test, type Page } from '@playwright/test';
import { GALLERY, TRAIL, people, signIn } from './support';

// Every page, as the roles that can see it, at desktop and phone widths.
const pages: { role: keyof typeof people | null; path: string; name: string }[] = [
	{ role: null, path: '/sign-in', name: 'sign-in' },
	{ role: null, path: '/sign-in/check-email', name: 'check-email' },
	{ role: null, path: '/invitations/unknown-token', name: 'invitation-bad' },
	{ role: 'owner', path: '/venues', name: 'venues' },
	{ role: 'owner', path: TRAIL, name: 'tonight' },
	{ role: 'owner', path: `${TRAIL}/rooms`, name: 'rooms' },
	{ role: 'owner', path: `${TRAIL}/members`, name: 'members' },
	{ role: 'owner', path: `${TRAIL}/settings`, name: 'settings' },
	{ role: 'owner', path: `${TRAIL}/activity`, name: 'activity' },
	{ role: 'owner', path: `${TRAIL}/mail`, name: 'mail-log' },
	{ role: 'owner', path: `${TRAIL}/mail/preview`, name: 'mail-preview' },
	{ role: 'manager', path: `${TRAIL}/mail`, name: 'manager-mail-log' },
	{ role: 'crew', path: TRAIL, name: 'crew-tonight' },
	{ role: 'crew', path: `${TRAIL}/rooms`, name: 'crew-rooms' },
	{ role: 'crew', path: `${TRAIL}/members`, name: 'crew-403' },
	{ role: 'crew', path: GALLERY, name: 'crew-404' }
];

async function checkA11y(page: Page) {
	const results = await new AxeBuilder({ page })
		.withTags(['wcag2a', 'wcag2aa', 'wcag21a', 'wcag21aa'])
		.analyze();
	const serious = results.violations.filter(
		(v) => v.impact === 'serious' || v.impact === 'critical'
	);
	expect(
		serious.map((v) => `${v.id}: ${v.nodes.map((n) => n.target.join(' ')).join(', ')}`)
	).toEqual([]);
}

for (const theme of ['dusk', 'low-light'] as const) {
	test(`every page passes the accessibility check (${theme})`, async ({
		page,
		context,
		baseURL
	}) => {
		test.setTimeout(360_000);
		await context.addCookies([{ name: 'gloaming-theme', value: theme, url: baseURL! }]);
		let signedInAs: string | null = null;
		for (const p of pages) {
			if (p.role !== signedInAs) {
				await context.clearCookies();
				await context.addCookies([{ name: 'gloaming-theme', value: theme, url: baseURL! }]);
				if (p.role) await signIn(page, people[p.role]);
				signedInAs = p.role;
			}
			for (const width of [1280, 390]) {
				await page.setViewportSize({ width, height: width === 390 ? 844 : 800 });
				await page.goto(p.path);
				await expect(page.locator('h1').first()).toBeVisible();
				await checkA11y(page);
				await page.screenshot({
					path: `tests/e2e/screenshots/${theme}-${p.name}-${width}.png`,
					fullPage: true
				});
			}
		}
	});
}

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
