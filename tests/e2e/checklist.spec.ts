import { expect, test, type Locator, type Page } from '@playwright/test';
import { TRAIL, people, signIn } from './support';

const PLATE = 'Hand in the well: Well-lip plate sensor test';

function check(page: Page, label: string): Locator {
	return page
		.getByTestId('check')
		.filter({ has: page.getByRole('heading', { name: label, exact: true }) });
}

async function readings(page: Page, idle: string, present: string) {
	const card = check(page, PLATE);
	await card.getByLabel('Idle reading').fill(idle);
	await card.getByLabel('Present reading').fill(present);
	await card.getByRole('button', { name: 'Record readings' }).click();
	return card;
}

test('crew checking off pre-show sensor tests: readings on a phone, live progress, sign-off after a stand-down', async ({
	browser,
	baseURL
}) => {
	// One long journey on two phones, about a dozen recorded checks.
	test.setTimeout(120_000);
	const phone = { viewport: { width: 390, height: 844 }, isMobile: true, hasTouch: true };
	const crewContext = await browser.newContext({ baseURL, ...phone });
	const crew = await crewContext.newPage();
	await signIn(crew, people.crew);
	await crew.goto(`${TRAIL}/my-nights`);
	await crew.getByRole('link', { name: 'Checklist for Fri 1 Oct 2027' }).click();
	await expect(crew.getByRole('heading', { level: 1, name: 'Pre-show checklist' })).toBeVisible();
	// Crew start on their own room; the switch shows every room, and stays through reloads.
	await expect(crew.getByRole('button', { name: 'Your room: Gatehouse' })).toHaveAttribute(
		'aria-pressed',
		'true'
	);
	// The demo Gatehouse has no props: nothing of the night's list is there.
	await expect(crew.getByText('Nothing to check in Gatehouse tonight.')).toBeVisible();
	await expect(check(crew, PLATE)).toHaveCount(0);
	await crew.getByRole('button', { name: /^All rooms/ }).click();
	// The long caution was shown once; on the next opening it is folded.
	await crew.reload();
	await expect(crew.getByTestId('caution-folded')).not.toHaveAttribute('open');
	await expect(check(crew, PLATE)).toHaveCount(1);
	const showPath = new URL(crew.url()).pathname.replace(/\/checklist$/, '');

	// The show manager watches the show page on another phone.
	const managerContext = await browser.newContext({ baseURL, ...phone });
	const manager = await managerContext.newPage();
	await signIn(manager, people.manager);
	await manager.goto(showPath);
	await expect(manager.getByTestId('checklist-summary')).toContainText('0 of');

	// The expected band sits beside the readings: an in-band idle and a present past enter pass.
	const plate = check(crew, PLATE);
	await expect(plate.getByText('Expected: idle 1,472.5 to 1,487.5')).toBeVisible();
	await readings(crew, '1480', '1552');
	await expect(plate.getByText('✓ Passed')).toBeVisible();
	await expect(manager.getByTestId('history')).toContainText(`pass · ${PLATE}`);

	// Re-tested later: the idle reading has drifted out of the band, so it fails; the page updates live.
	await readings(crew, '1493', '1552');
	await expect(plate.getByText('✗ Failed')).toBeVisible();
	await expect(manager.getByTestId('failures')).toContainText(PLATE);
	await expect(manager.getByTestId('history')).toContainText(`fail · ${PLATE}`);

	// Offline in a dark room: the result waits on the phone and is sent once, when signal returns.
	await crewContext.setOffline(true);
	await crew.getByRole('button', { name: 'Pass: Exits lit and clear' }).click();
	await expect(
		crew.getByText('1 result waiting to be sent — they will go when the phone has signal.')
	).toBeVisible();
	await crew.reload().catch(() => {});
	await crewContext.setOffline(false);
	await crew.goto(`${showPath}/checklist`);
	await expect(crew.getByText(/Waiting to send/)).toHaveCount(0);
	await expect(check(crew, 'Exits lit and clear').getByText('✓ Passed')).toBeVisible();
	await expect(manager.getByTestId('history').getByText(/Exits lit and clear/)).toHaveCount(1);

	// Everything else passes.
	const passes = crew.getByRole('button', { name: /^Pass: / });
	const count = await passes.count();
	for (let i = 0; i < count; i++) {
		const name = (await passes.nth(i).getAttribute('aria-label'))!;
		if (name === 'Pass: Exits lit and clear') continue;
		await passes.nth(i).click();
		await expect(check(crew, name.slice('Pass: '.length)).getByText('✓ Passed')).toBeVisible();
	}

	// Sign-off is refused while the plate fails, and says why.
	await manager.getByRole('button', { name: 'Sign off the night' }).click();
	const refusal = manager.getByRole('alert');
	await expect(refusal).toContainText('Not yet');
	await expect(refusal).toContainText(`Failed: ${PLATE}`);

	// The prop is stood down from the failed check: the preview says what it does, then a reason
	// and a confirmation; its scenes hold their safe state; then the night is signed.
	await manager
		.getByTestId('failures')
		.getByRole('link', { name: `Stand down the prop that failed ${PLATE}` })
		.click();
	await expect(manager.getByLabel('Prop', { exact: true })).toHaveValue(/.+/);
	const preview = manager.getByTestId('stand-down-preview');
	await expect(preview).toContainText('What standing down Hand in the well does tonight');
	await expect(preview.getByTestId('preview-scenes').getByRole('listitem').first()).toBeVisible();
	await manager
		.getByLabel('Reason')
		.fill('Plate reads high after the rain; lanterns held at full.');
	await manager.getByRole('button', { name: 'Stand down for tonight' }).click();
	await expect(manager.getByText(/Tick the box to confirm/)).toBeVisible();
	await manager.getByRole('checkbox', { name: /I have read what this does/ }).check();
	await manager.getByRole('button', { name: 'Stand down for tonight' }).click();
	await expect(manager.getByRole('heading', { name: 'Stood down tonight' })).toBeVisible();
	// Every scene that uses the prop says so (the demo well prop is in more than one scene).
	await expect(
		manager.getByText('A prop is stood down: the scene holds its safe state tonight.').first()
	).toBeVisible();
	// The demo night has unfilled required posts: sign-off is refused until each is acknowledged.
	await manager.getByRole('button', { name: 'Sign off the night' }).click();
	await expect(manager.getByRole('alert')).toContainText(
		/Acknowledge each of the night's \d+ crew problems/
	);
	const problems = manager
		.getByRole('group', { name: 'Crew problems to acknowledge' })
		.getByRole('checkbox');
	const problemCount = await problems.count();
	expect(problemCount).toBeGreaterThan(0);
	for (const box of await problems.all()) await box.check();
	await manager.getByRole('button', { name: 'Sign off the night' }).click();
	await expect(manager.getByText('✓ Signed off by Maren Quill')).toBeVisible();
	await expect(manager.getByTestId('acknowledged').getByRole('listitem')).toHaveCount(problemCount);

	// The crew's page closes the checklist.
	await crew.reload();
	await expect(crew.getByText(/Signed off by Maren Quill/)).toBeVisible();
	await expect(crew.getByRole('button', { name: /^Pass: / })).toHaveCount(0);

	await crewContext.close();
	await managerContext.close();
});

test('a change to a prop after its night was signed off asks why and puts a re-test on the next night', async ({
	browser,
	baseURL
}) => {
	// Follows the journey above, which signed off Fri 1 Oct 2027 with the well's prop on it.
	const context = await browser.newContext({ baseURL });
	const designer = await context.newPage();
	await signIn(designer, people.designer);
	await designer.goto(`${TRAIL}/props`);
	await designer.getByRole('link', { name: 'Hand in the well', exact: true }).click();
	await designer.getByRole('link', { name: 'Well-lip plate', exact: true }).click();
	await designer.getByText('Change the sensor').click();
	const gap = designer.getByLabel(/Gap to the hand/);
	await gap.fill(String(Number(await gap.inputValue()) + 2));
	await designer.getByRole('button', { name: 'Save sensor' }).click();
	await expect(designer.getByText(/say why you are changing it/)).toBeVisible();
	await designer.getByLabel('Why this change').fill('Plate re-glued after the rain.');
	await designer.getByRole('button', { name: 'Save sensor' }).click();
	await expect(designer.getByRole('status').filter({ hasText: 'Saved.' })).toBeVisible();

	await designer.goto(`${TRAIL}/seasons`);
	await designer.getByRole('link', { name: 'Hollow Pines Autumn 2027' }).click();
	await designer.getByRole('link', { name: 'Sat 2 Oct 2027' }).first().click();
	const changes = designer.getByRole('region', { name: 'Changed since the last signed-off night' });
	await expect(changes).toContainText('Hand in the well, Well-lip plate: Gap to the hand');
	await expect(changes).toContainText('Why: Plate re-glued after the rain.');
	// The night's checklist, as the show manager who runs it sees it, carries the re-test.
	const showPath = new URL(designer.url()).pathname;
	const managerContext = await browser.newContext({ baseURL });
	const manager = await managerContext.newPage();
	await signIn(manager, people.manager);
	await manager.goto(`${showPath}/checklist`);
	const everyRoom = manager.getByRole('button', { name: /^All rooms/ });
	if (await everyRoom.count()) await everyRoom.click();
	await expect(
		check(manager, 'Hand in the well: re-test after changes since its last signed-off night')
	).toBeVisible();
	await managerContext.close();
	await context.close();
});
