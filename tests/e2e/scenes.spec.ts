import { expect, test } from '@playwright/test';
import { TRAIL, people, signIn } from './support';

test('a designer builds a scene that brightens LEDs with hand depth, and a 4 Hz strobe raises the flash warning', async ({
	page
}) => {
	test.setTimeout(90_000);
	await signIn(page, people.designer);
	await page.goto(`${TRAIL}/props?q=${encodeURIComponent('Hand in the well')}`);
	await page.getByRole('link', { name: 'Hand in the well', exact: true }).click();

	// A couple of clicks from a capacitive prop: the response is made and the editor opens.
	await page
		.getByRole('button', { name: "Brighten Warm lanterns with Well-lip plate's depth" })
		.click();
	await expect(
		page.getByRole('heading', { level: 1, name: 'Hand in the well: Warm lanterns with depth' })
	).toBeVisible();
	await expect(page.getByLabel('Shape')).toHaveValue('rise');

	// The preview swatch glows brighter as the hand reaches deeper.
	const swatch = page.getByRole('img', { name: 'Warm lanterns swatch' });
	const depth = page.getByLabel(/Depth of Well-lip plate/);
	const brightness = () =>
		swatch.evaluate((el) =>
			(getComputedStyle(el).backgroundColor.match(/\d+/g) ?? [])
				.slice(0, 3)
				.reduce((sum, c) => sum + Number(c), 0)
		);
	await depth.fill('0.2');
	await expect.poll(brightness).toBeGreaterThan(0);
	const dim = await brightness();
	await depth.fill('0.9');
	await expect.poll(brightness).toBeGreaterThan(dim + 100);
	await expect(page.getByTestId('preview-numbers').first()).toContainText('level 90.0 %');

	// Typing 1-5-0 keeps every keystroke, says 150 % is out of range, and saving is refused
	// rather than keeping 15 or the old value silently.
	const high = page.getByLabel('High level (%)');
	await high.fill('');
	await high.pressSequentially('150');
	await expect(high).toHaveValue('150');
	await expect(
		page.getByText('150 % is outside the range: use from 0 % to 100 %. Not kept.')
	).toBeVisible();
	await page.getByRole('button', { name: 'Save scene' }).click();
	await expect(
		page.getByRole('alert').filter({ hasText: 'Not saved: fix these values first.' })
	).toContainText('High level (%): 150 % is outside the range');
	await expect(page.getByText('Saved.')).toHaveCount(0);

	// Save a change, reload: still there, and the history says what changed.
	await high.fill('80');
	await page.getByRole('button', { name: 'Save scene' }).click();
	await expect(page.getByText('Saved.')).toBeVisible();
	await page.reload();
	await expect(page.getByLabel('High level (%)')).toHaveValue('80');
	await expect(page.getByTestId('history')).toContainText('Changed 1 response');

	// A strobe cue at 4 Hz is a photosensitivity warning; at 3 Hz it is not (WCAG 2.3.1).
	const checks = page.getByTestId('checks');
	await page.getByRole('button', { name: 'Add cue at playhead' }).click();
	await page.getByLabel('Action').selectOption('strobe');
	await page.getByLabel('Rate (flashes a second)').fill('4');
	await expect(checks).toContainText('flashes 4 times in one second');
	await expect(checks).toContainText('Photosensitivity signage');
	await page.getByLabel('Rate (flashes a second)').fill('3');
	await expect(checks).not.toContainText('flashes');
	await expect(checks).not.toContainText('Photosensitivity signage');

	// Keyboard on the timeline: Shift+→ moves the focused cue by 1 s.
	await page.getByRole('button', { name: /^Flicker \/ strobe at 0 s/ }).focus();
	await page.keyboard.press('Shift+ArrowRight');
	await expect(page.getByRole('button', { name: /^Flicker \/ strobe at 1 s/ })).toBeFocused();
	await page.getByRole('button', { name: 'Save scene' }).click();
	await expect(page.getByText('Saved.')).toBeVisible();
	await page.reload();
	await expect(
		page.getByRole('button', { name: /^Flicker \/ strobe at 1 s: strobe at 3 Hz/ })
	).toBeVisible();
	await expect(page.getByTestId('history')).toContainText('Added 1 cue on Warm lanterns');

	// The scene list shows it in its room.
	await page.getByRole('link', { name: '← Scenes' }).click();
	await expect(
		page.getByRole('link', { name: 'Hand in the well: Warm lanterns with depth' })
	).toBeVisible();
});
