import { expect, test } from '@playwright/test';
import { TRAIL, people, signIn } from './support';

test('schedule opening nights: a season of Fridays and Saturdays, the calendar, crew on opening night', async ({
	page
}) => {
	test.setTimeout(90_000);
	await signIn(page, people.manager);
	await page.goto(`${TRAIL}/seasons/new`);
	await page.getByLabel('Season name').fill('Lantern Nights 2028');
	await page.getByLabel('First night').fill('2028-10-01');
	await expect(page.getByLabel('Friday')).toBeChecked();
	await expect(page.getByLabel('Saturday')).toBeChecked();
	await page.getByLabel('Last night', { exact: true }).fill('2028-10-31');
	await page.getByLabel('Dark nights').fill('2028-10-21');
	await page.getByLabel('Opening night').fill('2028-10-06');

	// Fridays and Saturdays of October 2028: 6, 7, 13, 14, 20, 21, 27, 28, less the dark 21st.
	await page.getByRole('button', { name: 'Preview nights' }).click();
	const preview = page.getByTestId('season-preview');
	await expect(preview.getByRole('heading', { name: 'Preview: 7 nights' })).toBeVisible();
	await expect(preview.getByText('Fri 6 Oct 2028')).toBeVisible();
	await expect(preview.getByRole('listitem').filter({ hasText: 'Sat 21 Oct 2028' })).toHaveCount(0);
	await expect(preview.getByText('Dark: Sat 21 Oct 2028')).toBeVisible();

	await page.getByRole('button', { name: 'Save season' }).click();
	await expect(page.getByRole('heading', { name: 'Lantern Nights 2028' })).toBeVisible();
	await expect(page.getByRole('heading', { name: 'Shows (7)' })).toBeVisible();

	await page.getByRole('link', { name: 'See it on the calendar' }).click();
	const calendar = page.getByTestId('calendar');
	await expect(calendar.getByText('October 2028')).toBeVisible();
	await expect(calendar.getByText('Dark night').first()).toBeVisible();
	await calendar.getByText('Opening night').first().click();

	await expect(page.getByRole('heading', { name: /Fri 6 Oct 2028/ })).toBeVisible();
	await expect(page.getByText('crew call 17:00 · doors 19:00–23:00')).toBeVisible();
	await expect(page.getByText(/is required and nobody is assigned/).first()).toBeVisible();

	await page
		.getByLabel('Position', { exact: true })
		.selectOption({ label: 'Room tech, Gatehouse' });
	await page.getByLabel('Crew member').selectOption({ label: 'Sully Fenwick' });
	await page.getByRole('button', { name: 'Assign' }).click();
	await expect(page.getByText('Sully Fenwick · call 17:00')).toBeVisible();

	await page.getByLabel('Position', { exact: true }).selectOption({ label: 'Safety lead' });
	await page.getByLabel('Crew member').selectOption({ label: 'Maren Quill' });
	await page.getByLabel('Own call').fill('16:30');
	await page.getByRole('button', { name: 'Assign' }).click();
	await expect(page.getByText('Maren Quill · call 16:30 (own call)')).toBeVisible();
	await expect(page.getByText('Safety lead is required and nobody is assigned.')).toHaveCount(0);
});

test('crew see their own nights, mark one they cannot work, and get a calendar link', async ({
	page,
	request
}) => {
	await signIn(page, people.crew);
	await page.goto(`${TRAIL}/my-nights`);
	await expect(page.getByRole('link', { name: 'Fri 1 Oct 2027', exact: true })).toBeVisible();
	await page.getByRole('button', { name: 'I cannot work Sat 2 Oct 2027' }).click();
	await expect(page.getByRole('button', { name: 'I can work Sat 2 Oct 2027' })).toBeVisible();
	await page.getByRole('button', { name: 'I can work Sat 2 Oct 2027' }).click();
	await expect(page.getByRole('button', { name: 'I cannot work Sat 2 Oct 2027' })).toBeVisible();

	await page.getByRole('button', { name: /Make a (new )?link/ }).click();
	const url = await page.getByLabel(/Your link/).inputValue();
	const res = await request.get(url);
	expect(res.status()).toBe(200);
	expect(res.headers()['content-type']).toContain('text/calendar');
	// RFC 5545 §3.1 unfolding and §3.3.11 escaped comma.
	const ics = (await res.text()).replace(/\r\n[ \t]/g, '');
	expect(ics).toContain('SUMMARY:Crew call: Room tech\\, Gatehouse\\, Hollow Pines Trail');
	// The season editor is for planners.
	const denied = await page.goto(`${TRAIL}/seasons/new`);
	expect(denied?.status()).toBe(403);
	expect((await request.get('/calendar/not-a-real-token-at-all-000.ics')).status()).toBe(404);
});

test('the calendar API checks its range and its role', async ({ page }) => {
	await signIn(page, people.designer);
	const api = `/api/v/hollow-pines-trail/calendar`;
	expect((await page.request.get(`${api}?start=nonsense&end=2027-11-01`)).status()).toBe(400);
	const ok = await page.request.get(`${api}?start=2027-09-27&end=2027-11-08`);
	expect(ok.status()).toBe(200);
	const body = await ok.json();
	expect(body.items.filter((i: { kind: string }) => i.kind === 'show')).toHaveLength(9);
	const move = await page.request.post(api, {
		data: { showId: '00000000-0000-0000-0000-000000000000', date: '2027-10-05' },
		headers: { origin: new URL(page.url()).origin }
	});
	expect(move.status()).toBe(403);
});

test.describe('from a device in another time zone', () => {
	// Hollow Pines Trail keeps New York time; this browser is in Auckland, 17 to 18 hours ahead.
	test.use({ timezoneId: 'Pacific/Auckland' });

	test('the calendar keeps venue time, and dragging a one-off show asks, then moves it', async ({
		page
	}) => {
		test.setTimeout(60_000);
		await signIn(page, people.manager);
		await page.goto(`${TRAIL}/calendar?date=2028-03-01`);
		await expect(page.getByTestId('calendar-zone')).toContainText('America/New_York');
		await page.getByLabel('Date', { exact: true }).fill('2028-03-08');
		await page.getByRole('button', { name: 'Add show' }).click();
		await expect(page.getByRole('link', { name: 'Open the new show' })).toBeVisible();

		await page.goto(`${TRAIL}/calendar?date=2028-03-01`);
		const calendar = page.getByTestId('calendar');
		const show = calendar.getByRole('button', { name: '19:00 One-off show' });
		const dayNumber = (date: string) => calendar.locator(`time[datetime="${date}"]`);
		const doorsOf = async () => {
			const res = await page.request.get(
				`/api/v/hollow-pines-trail/calendar?start=2028-03-01&end=2028-04-01`
			);
			const items = (await res.json()).items as { kind: string; start: string }[];
			return items.filter((i) => i.kind === 'show').map((i) => i.start);
		};
		// Doors 19:00 on the venue's clock (EST, UTC-5), not the device's (13:00 the next day).
		await expect(show).toBeVisible();
		expect(await doorsOf()).toEqual(['2028-03-09T00:00:00.000Z']);

		// Across the US clock change of 12 March 2028: still 19:00 on the venue's clock (EDT, UTC-4).
		let asked = '';
		page.once('dialog', (d) => {
			asked = d.message();
			void d.accept();
		});
		const from = (await show.boundingBox())!;
		const to = (await dayNumber('2028-03-15').boundingBox())!;
		await page.mouse.move(from.x + from.width / 2, from.y + from.height / 2);
		await page.mouse.down();
		// Into the 15th's cell, just below its day number.
		await page.mouse.move(to.x + to.width / 2, to.y + to.height + 20, { steps: 12 });
		await page.mouse.up();
		await expect(page.getByText('Show moved to 2028-03-15.')).toBeVisible();
		expect(asked).toContain('Move this one-off show to 2028-03-15?');
		expect(await doorsOf()).toEqual(['2028-03-15T23:00:00.000Z']);
		await expect(show).toBeVisible();
		await page.reload();
		await expect(show).toBeVisible();
	});
});
