import { readFileSync } from 'node:fs';
import { createRequire } from 'node:module';
import { expect, test, type Page } from '@playwright/test';
import { GALLERY, TRAIL, people, sessionFile } from './support';

// Every page, as the roles that can see it, at desktop and phone widths.
// `follow` names links to click from `path`, for pages whose address holds a generated id;
// a function path finds its page itself.
type PagePath = string | ((page: Page) => Promise<string>);

/** Demo props have generated ids: find a page by following links from the props table. */
function demoPage(prop: string, child?: string): PagePath {
	return async (page) => {
		await page.goto(`${TRAIL}/props?q=${encodeURIComponent(prop)}`);
		await page.getByRole('link', { name: prop, exact: true }).click();
		await expect(page.getByRole('heading', { level: 1, name: prop })).toBeVisible();
		if (child) {
			await page.getByRole('link', { name: child, exact: true }).click();
			await expect(page.getByRole('heading', { level: 1, name: child })).toBeVisible();
		}
		return new URL(page.url()).pathname;
	};
}

const pages: {
	role: keyof typeof people | null;
	path: PagePath;
	name: string;
	follow?: string[];
	/** A long page: its full-page screenshots need more time on a loaded machine. */
	slow?: boolean;
}[] = [
	{ role: null, path: '/sign-in', name: 'sign-in' },
	{ role: null, path: '/sign-in/check-email', name: 'check-email' },
	{ role: null, path: '/invitations/unknown-token', name: 'invitation-bad' },
	{ role: 'owner', path: '/venues', name: 'venues' },
	{ role: 'owner', path: TRAIL, name: 'tonight' },
	{ role: 'owner', path: `${TRAIL}/rooms`, name: 'rooms' },
	{ role: 'owner', path: `${TRAIL}/members`, name: 'members' },
	{ role: 'owner', path: `${TRAIL}/settings`, name: 'settings' },
	{ role: 'owner', path: `${TRAIL}/activity`, name: 'activity' },
	{ role: 'owner', path: `${TRAIL}/calendar?date=2027-10-01`, name: 'calendar' },
	{ role: 'owner', path: `${TRAIL}/seasons`, name: 'seasons' },
	{ role: 'owner', path: `${TRAIL}/seasons/new`, name: 'season-new' },
	{ role: 'owner', path: `${TRAIL}/positions`, name: 'positions' },
	{
		role: 'owner',
		path: `${TRAIL}/seasons`,
		follow: ['Hollow Pines Autumn 2027'],
		name: 'season'
	},
	{
		role: 'manager',
		path: `${TRAIL}/seasons`,
		follow: ['Hollow Pines Autumn 2027', 'Season report'],
		name: 'season-report',
		slow: true
	},
	{
		role: 'owner',
		path: `${TRAIL}/seasons`,
		follow: ['Hollow Pines Autumn 2027', 'Fri 1 Oct 2027'],
		name: 'show'
	},
	{
		role: 'manager',
		path: `${TRAIL}/seasons`,
		follow: ['Hollow Pines Autumn 2027', 'Fri 1 Oct 2027', 'Preview run sheets'],
		name: 'run-sheets'
	},
	{
		role: 'manager',
		path: `${TRAIL}/seasons`,
		follow: [
			'Hollow Pines Autumn 2027',
			'Fri 1 Oct 2027',
			'Preview run sheets',
			"Open Sully Fenwick's run sheet on its own"
		],
		name: 'run-sheet'
	},
	{
		role: 'manager',
		path: `${TRAIL}/seasons`,
		follow: [
			'Hollow Pines Autumn 2027',
			'Fri 1 Oct 2027',
			'Preview run sheets',
			"Open Maren Quill's run sheet on its own"
		],
		name: 'run-sheet-safety-lead'
	},
	{
		role: 'crew',
		path: `${TRAIL}/my-nights`,
		follow: ['Fri 1 Oct 2027', 'Your run sheet'],
		name: 'crew-run-sheets'
	},
	{
		role: 'owner',
		path: `${TRAIL}/seasons`,
		follow: ['Hollow Pines Autumn 2027', 'Fri 1 Oct 2027', 'Printable checklist'],
		name: 'checklist-print'
	},
	{
		role: 'manager',
		path: async (page) => {
			await page.goto(`${TRAIL}/seasons`);
			await page.getByRole('link', { name: 'Hollow Pines Autumn 2027' }).click();
			await page.getByRole('link', { name: 'Fri 1 Oct 2027' }).first().click();
			await page
				.getByRole('link', { name: /^(Choose a prop to stand down|Stand down another prop)…$/ })
				.click();
			const prop = await page
				.getByLabel('Prop', { exact: true })
				.locator('option:not([value=""])')
				.first()
				.getAttribute('value');
			return `${new URL(page.url()).pathname}?prop=${prop}`;
		},
		name: 'stand-down'
	},
	{
		role: 'manager',
		path: `${TRAIL}/seasons`,
		follow: ['Hollow Pines Autumn 2027', 'Fri 1 Oct 2027', 'Incidents and show stops'],
		name: 'incidents'
	},
	{
		role: 'crew',
		path: `${TRAIL}/my-nights`,
		follow: ['Checklist for Fri 1 Oct 2027', 'Report an incident'],
		name: 'crew-incidents'
	},
	{
		role: 'manager',
		path: `${TRAIL}/seasons`,
		follow: ['Hollow Pines Autumn 2027', 'Fri 1 Oct 2027', 'Close-of-night checklist'],
		name: 'close-of-night'
	},
	{ role: 'manager', path: `${TRAIL}/safety`, name: 'safety-items' },
	{
		role: 'crew',
		path: `${TRAIL}/my-nights`,
		follow: ['Checklist for Fri 1 Oct 2027'],
		name: 'crew-checklist',
		slow: true
	},
	{ role: 'owner', path: `${TRAIL}/mail`, name: 'mail-log' },
	{ role: 'owner', path: `${TRAIL}/mail/preview`, name: 'mail-preview' },
	{ role: 'manager', path: `${TRAIL}/mail`, name: 'manager-mail-log' },
	{ role: 'crew', path: TRAIL, name: 'crew-tonight' },
	{ role: 'crew', path: `${TRAIL}/rooms`, name: 'crew-rooms' },
	{ role: 'crew', path: `${TRAIL}/my-nights`, name: 'crew-my-nights' },
	{ role: 'crew', path: `${TRAIL}/calendar?date=2027-10-01`, name: 'crew-calendar' },
	{ role: 'owner', path: `${TRAIL}/props`, name: 'props' },
	{ role: 'owner', path: `${TRAIL}/props/new`, name: 'prop-new' },
	{ role: 'owner', path: `${TRAIL}/controllers`, name: 'controllers' },
	{ role: 'owner', path: demoPage('Hand in the well'), name: 'prop' },
	{ role: 'owner', path: demoPage('Hand in the well', 'Well-lip plate'), name: 'sensor' },
	{ role: 'owner', path: demoPage('Hand in the well', 'Warm lanterns'), name: 'output-led' },
	{ role: 'owner', path: demoPage('Barn-loft drop', 'Drop valve'), name: 'output-relay' },
	{ role: 'owner', path: `${TRAIL}/scenes`, name: 'scenes' },
	{ role: 'owner', path: `${TRAIL}/scenes/new`, name: 'scene-new' },
	{ role: 'owner', path: `${TRAIL}/scenes`, follow: ['Well lanterns swell'], name: 'scene' },
	{ role: 'owner', path: `${TRAIL}/scenes`, follow: ['Owl call mist'], name: 'scene-fog' },
	{ role: 'crew', path: `${TRAIL}/scenes`, follow: ['Loft drop'], name: 'crew-scene' },
	{ role: 'crew', path: `${TRAIL}/props`, name: 'crew-props' },
	{ role: 'crew', path: demoPage('Orchard mist'), name: 'crew-prop' },
	{ role: 'crew', path: `${TRAIL}/members`, name: 'crew-403' },
	{ role: 'crew', path: GALLERY, name: 'crew-404' }
];

// axe-core is put into the page once and run there directly: each run through a fresh injection
// costs about a second, which across every page and both themes was most of the page checks.
const axeSource = readFileSync(
	createRequire(import.meta.url).resolve('axe-core/axe.min.js'),
	'utf8'
);

/** WCAG 2.1 A and AA; `only` limits the run to some rules. Only violations get full details. */
async function checkA11y(page: Page, only?: string[]) {
	// Evaluated through the browser's debugging protocol, so the page's CSP does not block it.
	if (!(await page.evaluate(() => 'axe' in window))) await page.evaluate(axeSource);
	const violations = await page.evaluate(async (rules) => {
		const axe = (window as unknown as { axe: typeof import('axe-core') }).axe;
		const result = await axe.run(document, {
			runOnly: rules
				? { type: 'rule', values: rules }
				: { type: 'tag', values: ['wcag2a', 'wcag2aa', 'wcag21a', 'wcag21aa'] },
			resultTypes: ['violations']
		});
		return result.violations.map((v) => ({
			id: v.id,
			impact: v.impact,
			targets: v.nodes.map((n) => n.target.join(' '))
		}));
	}, only ?? null);
	const serious = violations.filter((v) => v.impact === 'serious' || v.impact === 'critical');
	expect(serious.map((v) => `${v.id}: ${v.targets.join(', ')}`)).toEqual([]);
}

// Full-page screenshots are most of a page check's time, so they are taken only when asked for
// (`SCREENSHOTS=1 npm test -- --e2e tests/e2e/pages.spec.ts`); the phone width is still loaded and
// checked for sideways scrolling either way.
const SCREENSHOTS = process.env.SCREENSHOTS === '1';

// Each page is checked in one browser context: dusk at desktop width (every axe rule) and phone
// width, then low-light at desktop width. Low-light changes colours only, so there axe checks
// contrast alone. The sessions come from sessions.setup.ts.
for (const p of pages) {
	test(`${p.name} passes the accessibility check`, async ({ browser, baseURL }) => {
		// A load or two, two axe runs and, when asked for, three full-page screenshots.
		test.setTimeout(p.slow ? 120_000 : 60_000);
		const context = await browser.newContext({
			baseURL,
			storageState: p.role ? sessionFile(p.role) : undefined
		});
		await context.addCookies([{ name: 'gloaming-theme', value: 'dusk', url: baseURL! }]);
		const page = await context.newPage();
		let path = typeof p.path === 'string' ? p.path : await p.path(page);
		if (p.follow) {
			await page.goto(path);
			for (const name of p.follow) {
				path = (await page.getByRole('link', { name, exact: true }).getAttribute('href'))!;
				await page.goto(path);
			}
		}
		const shot = async (theme: string, width: number) => {
			if (!SCREENSHOTS) return;
			await page.screenshot({
				path: `tests/e2e/screenshots/${theme}-${p.name}-${width}.png`,
				fullPage: true
			});
		};

		await page.goto(path);
		await expect(page.locator('h1').first()).toBeVisible();
		await checkA11y(page);
		await shot('dusk', 1280);
		await page.setViewportSize({ width: 390, height: 844 });
		await shot('dusk', 390);
		// Charts resize after the viewport does; a busy machine can measure before they have.
		await expect
			.poll(() => page.evaluate(() => document.documentElement.scrollWidth), {
				message: 'the page scrolls sideways on a phone'
			})
			.toBeLessThanOrEqual(390);

		// The server renders the theme from a cookie onto <html>; setting the same attribute here
		// gives the same styles without loading the page again (shell.spec.ts checks the cookie).
		await page.setViewportSize({ width: 1280, height: 800 });
		await page.evaluate(() => document.documentElement.setAttribute('data-theme', 'low-light'));
		await checkA11y(page, ['color-contrast']);
		await shot('low-light', 1280);
		await context.close();
	});
}

test('the page check finds what it looks for', async ({ page }) => {
	await page.goto('/sign-in');
	await page.evaluate(() => {
		const p = document.createElement('p');
		p.textContent = 'Grey on grey';
		p.style.color = '#555555';
		p.style.background = '#444444';
		document.querySelector('main')!.append(p);
	});
	await expect(checkA11y(page, ['color-contrast'])).rejects.toThrow(/color-contrast/);
	await page.evaluate(() => (document.title = ''));
	await expect(checkA11y(page)).rejects.toThrow(/document-title/);
});

test('the season report prints without the navigation, a section a page', async ({
	browser,
	baseURL
}) => {
	const context = await browser.newContext({ baseURL, storageState: sessionFile('manager') });
	const page = await context.newPage();
	await page.goto(`${TRAIL}/seasons`);
	await page.getByRole('link', { name: 'Hollow Pines Autumn 2027', exact: true }).click();
	await page.getByRole('link', { name: 'Season report', exact: true }).click();
	await expect(page.getByRole('heading', { level: 1 })).toContainText('Season report');
	await page.emulateMedia({ media: 'print' });
	await expect(page.locator('header').first()).toBeHidden();
	await expect(page.getByRole('button', { name: 'Print' })).toBeHidden();
	const breaks = await page
		.locator('section')
		.evaluateAll((all) => all.map((s) => getComputedStyle(s).breakBefore));
	expect(breaks).toEqual(['auto', 'page', 'page', 'page', 'page']);
	if (SCREENSHOTS)
		await page.screenshot({
			path: 'tests/e2e/screenshots/print-season-report.png',
			fullPage: true
		});
	await context.close();
});
