import { expect, test, type BrowserContext, type Page } from '@playwright/test';
import postgres from 'postgres';
import { GALLERY, people, signIn } from './support';

// A crew phone loses signal in a dark room: the checklist of tonight's show was kept on the phone
// without being opened, opens and reloads without signal, and two results (one with a photo) wait
// on the phone through a closed tab and go, once each, with the times they were recorded.

const PNG_1x1 = Buffer.from(
	'iVBORw0KGgoAAAANSUhEUgAAAAEAAAABCAYAAAAfFcSJAAAADUlEQVR42mNk+M9QDwADhgGAWjR9awAAAABJRU5ErkJggg==',
	'base64'
);
const shots = process.env.SCREENSHOTS ? 'tests/e2e/screenshots' : null;

/**
 * Tonight's show in the gallery, starting two hours from now, with the designer (crew there)
 * called. Made in the database: the demo season's nights are in another year, and the trail's
 * nights belong to the other journeys.
 */
async function tonightInTheGallery(): Promise<{ showId: string }> {
	const sql = postgres(process.env.E2E_DATABASE_URL!, { max: 1, onnotice: () => {} });
	try {
		const [venue] =
			await sql`select id, time_zone from venues where slug = 'marrowfield-night-gallery'`;
		const [person] = await sql`select id from users where email = ${people.designer}`;
		const hour = 3_600_000;
		const now = Date.now();
		const date = new Intl.DateTimeFormat('en-CA', { timeZone: venue.time_zone }).format(
			new Date(now + 2 * hour)
		);
		const [show] = await sql`
			insert into shows (venue_id, date, doors_open, doors_close, crew_call, notes)
			values (${venue.id}, ${date}, ${new Date(now + 2 * hour)}, ${new Date(now + 5 * hour)},
				${new Date(now + hour)}, 'Offline journey')
			returning id`;
		const [post] = await sql`
			insert into positions (venue_id, name, required) values (${venue.id}, 'Gallery floor', false)
			on conflict (venue_id, name) do update set name = excluded.name
			returning id`;
		await sql`
			insert into assignments (venue_id, show_id, position_id, person_id)
			values (${venue.id}, ${show.id}, ${post.id}, ${person.id})`;
		return { showId: show.id };
	} finally {
		await sql.end();
	}
}

async function keptOnPhone(page: Page, path: string): Promise<boolean> {
	return page.evaluate(async (p) => {
		const cache = await caches.open('gloaming-saved');
		const [html, data] = await Promise.all([cache.match(p), cache.match(`${p}/__data.json`)]);
		return Boolean(html && data);
	}, path);
}

async function screenshot(page: Page, name: string) {
	if (shots) await page.screenshot({ path: `${shots}/${name}-390.png`, fullPage: false });
}

async function offline(context: BrowserContext, on: boolean) {
	await context.setOffline(on);
}

test('a crew phone without signal: the kept checklist opens, reloads and records; results go once each with their recorded times', async ({
	browser,
	baseURL
}) => {
	test.setTimeout(90_000);
	const { showId } = await tonightInTheGallery();
	const checklistPath = `${GALLERY}/shows/${showId}/checklist`;
	const context = await browser.newContext({
		baseURL,
		viewport: { width: 390, height: 844 },
		isMobile: true,
		hasTouch: true,
		serviceWorkers: 'allow'
	});
	let phone = await context.newPage();
	await signIn(phone, people.designer);

	// Online, the phone opens Tonight only; its service worker keeps the night's checklist too.
	await phone.goto(GALLERY);
	await expect(phone.getByRole('link', { name: 'Open the checklist' })).toBeVisible();
	await expect.poll(() => keptOnPhone(phone, checklistPath), { timeout: 20_000 }).toBe(true);
	await expect.poll(() => keptOnPhone(phone, GALLERY)).toBe(true);

	// No signal: the checklist opens from Tonight, never having been opened before.
	await offline(context, true);
	await phone.getByRole('link', { name: 'Open the checklist' }).click();
	await expect(phone.getByRole('heading', { level: 1, name: 'Pre-show checklist' })).toBeVisible();
	await expect(phone).toHaveURL(new RegExp(`${checklistPath}$`));
	// The checks come from the copy on the phone, and the page says so.
	await expect(phone.getByText(/No signal: this is the copy kept on this phone at/)).toBeVisible();

	// It reloads without signal, and opens again from Tonight.
	await phone.reload();
	await expect(phone.getByRole('heading', { level: 1, name: 'Pre-show checklist' })).toBeVisible();
	await phone
		.getByRole('navigation', { name: 'Venue' })
		.getByRole('link', { name: 'Tonight' })
		.click();
	await expect(phone).toHaveURL(new RegExp(`${GALLERY}$`));
	await phone.getByRole('link', { name: 'Open the checklist' }).click();
	await expect(phone.getByRole('heading', { level: 1, name: 'Pre-show checklist' })).toBeVisible();

	// Two results, the first with a photo, recorded without signal.
	const passes = phone.getByRole('button', { name: /^Pass: / });
	const first = (await passes.nth(0).getAttribute('aria-label'))!.slice('Pass: '.length);
	const second = (await passes.nth(1).getAttribute('aria-label'))!.slice('Pass: '.length);
	const card = (label: string) =>
		phone
			.getByTestId('check')
			.filter({ has: phone.getByRole('heading', { name: label, exact: true }) });
	await card(first).getByText('Add a note or photo').click();
	await card(first)
		.getByLabel('Photo')
		.setInputFiles({ name: 'exit-sign.png', mimeType: 'image/png', buffer: PNG_1x1 });
	await card(first).getByLabel('Note').fill('Sign lit, path clear');
	const before = Date.now();
	await phone.getByRole('button', { name: `Pass: ${first}` }).click();
	await expect(card(first).getByText('Waiting to send: pass')).toBeVisible();
	await phone.getByRole('button', { name: `Fail: ${second}` }).click();
	await expect(card(second).getByText('Waiting to send: fail')).toBeVisible();
	const after = Date.now();
	await expect(
		phone.getByText('2 results waiting to be sent — they will go when the phone has signal.')
	).toBeVisible();

	// The tab is closed; a new one opens the checklist, still without signal: both still wait.
	await phone.close();
	phone = await context.newPage();
	await phone.goto(checklistPath);
	const waiting = phone.getByText(
		'2 results waiting to be sent — they will go when the phone has signal.'
	);
	await expect(waiting).toBeVisible();
	await screenshot(phone, 'checklist-waiting');

	// A few seconds later the signal returns: they go, in order, and the page says what was sent.
	await phone.waitForTimeout(2500);
	const online = Date.now();
	await offline(context, false);
	await expect(phone.getByText(/^✓ 2 results from this phone sent, the last at/)).toBeVisible({
		timeout: 15_000
	});
	await expect(phone.getByText(/waiting to be sent/)).toHaveCount(0);
	await expect(card(first).getByText('✓ Passed')).toBeVisible();
	await expect(card(second).getByText('✗ Failed')).toBeVisible();
	await phone
		.getByTestId('sent')
		.getByText(/results from this phone sent/)
		.click();
	await screenshot(phone, 'checklist-sent');

	// Signing out leaves no copy of this person's pages: without signal, the checklist is gone.
	await phone.getByRole('button', { name: 'Sign out' }).click();
	await expect(phone).toHaveURL(/\/sign-in/);
	expect(await phone.evaluate(() => caches.has('gloaming-saved'))).toBe(false);
	await offline(context, true);
	await phone.goto(checklistPath);
	await expect(phone.getByRole('heading', { level: 1, name: 'No signal' })).toBeVisible();
	await expect(phone.getByText('Pre-show checklist')).toHaveCount(0);
	await context.close();

	// The show manager's copy: each result stored once, with the time the phone recorded it.
	const manager = await browser.newContext({ baseURL, viewport: { width: 390, height: 844 } });
	const desk = await manager.newPage();
	await signIn(desk, people.manager);
	const res = await desk.request.get(`/api${GALLERY}/shows/${showId}/checks`);
	expect(res.status()).toBe(200);
	const state = (await res.json()) as {
		checks: { id: string; label: string }[];
		history: {
			checkId: string;
			outcome: string;
			recordedAt: string;
			receivedAt: string;
			note: string | null;
			photoUrl: string | null;
		}[];
	};
	const idOf = (label: string) => state.checks.find((c) => c.label === label)!.id;
	const stored = (label: string) => state.history.filter((h) => h.checkId === idOf(label));
	expect(stored(first)).toHaveLength(1);
	expect(stored(second)).toHaveLength(1);
	expect(state.history).toHaveLength(2);
	for (const [label, outcome] of [
		[first, 'pass'],
		[second, 'fail']
	] as const) {
		const [r] = stored(label);
		expect(r.outcome).toBe(outcome);
		// Recorded while offline, received only after the signal returned.
		const recorded = Date.parse(r.recordedAt);
		expect(recorded).toBeGreaterThanOrEqual(before - 1000);
		expect(recorded).toBeLessThanOrEqual(after + 1000);
		expect(Date.parse(r.receivedAt)).toBeGreaterThanOrEqual(online - 1000);
	}
	const [withPhoto] = stored(first);
	expect(withPhoto.note).toBe('Sign lit, path clear');
	expect(withPhoto.photoUrl).not.toBeNull();
	const photo = await desk.request.get(withPhoto.photoUrl!);
	expect(photo.status()).toBe(200);
	expect(photo.headers()['content-type']).toBe('image/png');
	expect(stored(second)[0].photoUrl).toBeNull();

	// And the show page lists both.
	await desk.goto(`${GALLERY}/shows/${showId}`);
	const history = desk.getByTestId('history');
	await expect(history).toContainText(`pass · ${first}`);
	await expect(history).toContainText(`fail · ${second}`);
	await manager.close();
});
