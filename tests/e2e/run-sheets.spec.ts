import { expect, test } from '@playwright/test';
import { TRAIL, firstLink, lastMailId, people, signIn, waitForMail } from './support';

test('receiving a run-sheet e-mail', async ({ page, context }) => {
	test.setTimeout(90_000);
	await signIn(page, people.manager);
	// Tonight tells the show manager where the next show's run sheets stand.
	await page.goto(TRAIL);
	await expect(page.getByTestId('tonight-run-sheets')).toContainText('Not sent yet.');
	await page.goto(`${TRAIL}/seasons`);
	await page.getByRole('link', { name: 'Hollow Pines Autumn 2027' }).click();
	await page.getByRole('link', { name: 'Fri 8 Oct 2027' }).click();
	await expect(page.getByRole('heading', { level: 1, name: /Fri 8 Oct 2027/ })).toBeVisible();
	const panel = page.getByRole('region', { name: 'Run sheets' });
	await expect(panel.getByText('Not sent yet.')).toBeVisible();

	// Put the crew member in the room where the demo scene "Lantern walk" runs, on their own call.
	await page
		.getByLabel('Position', { exact: true })
		.selectOption({ label: 'Room tech, Lantern Walk' });
	await page.getByLabel('Crew member').selectOption({ label: 'Sully Fenwick' });
	await page.getByLabel('Own call').fill('17:15');
	await page.getByRole('button', { name: 'Assign' }).click();
	await expect(page.getByText('Sully Fenwick · call 17:15 (own call)')).toBeVisible();

	const since = await lastMailId();
	await panel.getByRole('button', { name: 'Send run sheets' }).click();
	await expect(panel.getByRole('status')).toHaveText('Queued 1 run sheet.');

	const mail = await waitForMail(people.crew, since);
	expect(mail.subject).toBe('Run sheet for Fri 8 Oct 2027 at Hollow Pines Trail');
	expect(mail.text).toContain('Crew call: 17:15 (New York time)');
	expect(mail.text).toContain('Position: Room tech, Lantern Walk');
	expect(mail.text).toContain('* Lantern walk (Lantern Walk)');
	expect(mail.text).toContain('0:06 strobe Warm lanterns at 6 Hz for 1.5 s');
	expect(mail.text).toContain('! Strobe: photosensitivity signage must be up');
	expect(mail.html).toContain('Lantern walk');
	const ics = mail.attachments?.find((a) => a.filename.endsWith('.ics'));
	expect(ics?.contentType).toContain('text/calendar');
	// RFC 5545 §3.1 unfolding, then the crew call in the venue's zone.
	const calendar = Buffer.from(ics!.content, 'base64')
		.toString('utf8')
		.replace(/\r\n[ \t]/g, '');
	expect(calendar).toContain('DTSTART;TZID=America/New_York:20271008T171500');
	expect(calendar).toContain('BEGIN:VTIMEZONE');

	// The show page follows delivery until the message is sent.
	const row = panel.getByTestId('run-sheet-delivery').filter({ hasText: 'Sully Fenwick' });
	await expect(row.getByTestId('run-sheet-status')).toHaveText('Sent', { timeout: 15_000 });
	await expect(panel.getByText('Sent 1 of 1')).toBeVisible();

	// Sending again at the same version sends nothing.
	await panel.getByRole('button', { name: 'Send run sheets' }).click();
	await expect(panel.getByRole('status')).toHaveText(
		'Everyone already has the current run sheet; nothing new to send.'
	);

	// A later call for that person: only they get a changed run sheet, with a new calendar version.
	await page
		.getByLabel('Position', { exact: true })
		.selectOption({ label: 'Room tech, Lantern Walk' });
	await page.getByLabel('Crew member').selectOption({ label: 'Sully Fenwick' });
	await page.getByLabel('Own call').fill('17:45');
	await page.getByRole('button', { name: 'Assign' }).click();
	await expect(page.getByText('Sully Fenwick · call 17:45 (own call)')).toBeVisible();
	const changed = await waitForMail(people.crew, mail.id);
	expect(changed.subject).toBe('Changed: Run sheet for Fri 8 Oct 2027 at Hollow Pines Trail');
	expect(changed.text).toContain('Crew call: 17:45 (was 17:15)');
	const newCall = Buffer.from(changed.attachments![0].content, 'base64').toString('utf8');
	expect(newCall).toContain('DTSTART;TZID=America/New_York:20271008T174500');
	expect(newCall).toMatch(/SEQUENCE:[1-9]/);
	await expect(row).toContainText('version 2 · change notice');

	// The crew member opens the link in the message and sees their own sheet, and only theirs.
	await context.clearCookies();
	await signIn(page, people.crew);
	await page.goto(firstLink(mail.text));
	await expect(
		page.getByRole('heading', { level: 1, name: 'Run sheet, Fri 8 Oct 2027' })
	).toBeVisible();
	await expect(page.getByTestId('run-sheet-call')).toHaveText('17:45 (New York time)');
	await expect(page.getByText('Strobe: photosensitivity signage must be up')).toBeVisible();
	await expect(page.getByText('Stood down')).toHaveCount(0);
	await page.goto(firstLink(mail.text).replace(/\/[^/]+$/, ''));
	await expect(page.getByRole('article')).toHaveCount(1);
	await expect(page.getByRole('button', { name: 'Send run sheets' })).toHaveCount(0);
});
