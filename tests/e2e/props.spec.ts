import { expect, test } from '@playwright/test';
import { TRAIL, people, signIn } from './support';

/** A small capture: idle readings near 100 counts, present near 160, ten readings a second. */
function captureCsv(rows = 400) {
	const lines = ['time,reading,label'];
	for (let i = 0; i < rows; i++) {
		const present = i >= rows / 2;
		const wobble = ((i * 37) % 9) - 4;
		lines.push(
			`${(i / 10).toFixed(1)},${(present ? 160 : 100) + wobble},${present ? 'present' : 'idle'}`
		);
	}
	return lines.join('\n') + '\n';
}

const PNG_1x1 = Buffer.from(
	'iVBORw0KGgoAAAANSUhEUgAAAAEAAAABCAYAAAAfFcSJAAAADUlEQVR42mNk+M9QDwADhgGAWjR9awAAAABJRU5ErkJggg==',
	'base64'
);

test('a designer registers a capacitive prop with an LED string, calibrates it and downloads the level table', async ({
	page
}) => {
	test.setTimeout(60_000);
	await signIn(page, people.designer);
	await page.goto(`${TRAIL}/props`);
	await page.getByRole('link', { name: 'New prop' }).click();
	await page.getByRole('button', { name: 'Register prop' }).click();
	await expect(page.getByText('Give a name.')).toBeVisible();
	await page.getByLabel('Name').fill('Raven perch');
	await page.getByLabel('Room').selectOption({ label: 'Gatehouse' });
	await page.getByLabel('Controller').selectOption({ label: 'Lantern board A' });
	await page.getByRole('button', { name: 'Register prop' }).click();
	await expect(page.getByRole('heading', { level: 1, name: 'Raven perch' })).toBeVisible();

	// Sensor: the plate maths follow the typing.
	await page.getByText('Add a sensor').click();
	await page.getByLabel('Sensor name').fill('Perch plate');
	const plate = page.getByTestId('plate-pf');
	await expect(plate).toContainText('pF');
	const before = await plate.textContent();
	await page.getByLabel('Gap to the hand').fill('5');
	await expect(plate).not.toHaveText(before!);
	await expect(page.getByText('Estimate:')).toBeVisible();
	// The resistor can be typed the way the trade writes it (IEC 60062: 4M7 = 4.7 MΩ).
	// The discharge time is RC·ln(V0/Vref), linear in R: 4.7 times the default 1 MΩ figure.
	const discharge = page.getByTestId('discharge-us');
	const micros = async () => Number((await discharge.textContent())!.replace(/[^\d.]/g, ''));
	const at1M = await micros();
	await page.getByLabel('Discharge resistor').fill('4M7');
	await expect(page.getByText('= 4.7 MΩ')).toBeVisible();
	await expect(page.getByText(/must be a number|Invalid input/)).toHaveCount(0);
	await expect.poll(async () => (await micros()) / at1M).toBeCloseTo(4.7, 2);
	await page.getByLabel('Discharge resistor').fill('4,7M');
	await page.getByRole('button', { name: 'Add sensor' }).click();
	await expect(page.getByText('Use a point for decimals (4.7, not 4,7).')).toBeVisible();
	await page.getByLabel('Discharge resistor').fill('4M7');
	await page.getByRole('button', { name: 'Add sensor' }).click();
	await expect(page.getByRole('link', { name: 'Perch plate' })).toBeVisible();

	// Output: an LED string, with the resistor worked out.
	await page.getByText('Add an output').click();
	await page.getByLabel('Output name').fill('Perch glow');
	await page.getByRole('button', { name: 'Add output' }).click();
	await expect(page.getByText('Choose what it does on alarm or stop.')).toBeVisible();
	await expect(page.getByLabel('Output name')).toHaveValue('Perch glow');
	await page.getByLabel('Safe state').selectOption({ label: 'Lights to full' });
	await expect(page.getByTestId('resistor-snapped')).toContainText('E24');
	await page.getByRole('button', { name: 'Add output' }).click();
	await expect(page.getByRole('link', { name: 'Perch glow' })).toBeVisible();

	// Capture: a bad file is refused with its line; a good one calibrates.
	await page.getByRole('link', { name: 'Perch plate' }).click();
	const upload = page.getByLabel('Upload a capture (CSV)');
	await upload.setInputFiles({
		name: 'broken.csv',
		mimeType: 'text/csv',
		buffer: Buffer.from('time,reading,label\n0,100,idle\n0.1,abc,idle\n')
	});
	await expect(page.getByText(/Line 3: reading 'abc' is not a number/)).toBeVisible();
	await upload.setInputFiles({
		name: 'perch-evening.csv',
		mimeType: 'text/csv',
		buffer: Buffer.from(captureCsv())
	});
	await expect(page.getByText('perch-evening.csv uploaded.')).toBeVisible();
	await expect(page.getByTestId('calibration')).toContainText('Separation');
	await page.getByRole('button', { name: 'Apply suggested trigger range' }).click();
	await expect(page.getByText('Suggested trigger range applied.')).toBeVisible();
	await expect(page.getByTestId('trigger-range')).not.toContainText('—');

	// A photo: uploaded, shown from the store, removed.
	await page.getByRole('link', { name: '← Raven perch' }).click();
	await page.getByLabel('Upload a photo or wiring PDF').setInputFiles({
		name: 'perch.png',
		mimeType: 'image/png',
		buffer: PNG_1x1
	});
	await expect(page.getByText('perch.png uploaded.')).toBeVisible();
	const photo = page.getByRole('img', { name: 'Photo of Raven perch: perch.png' });
	await expect(photo).toBeVisible();
	const served = await page.request.get((await photo.getAttribute('src'))!);
	expect(served.headers()['content-type']).toBe('image/png');
	expect(Buffer.from(await served.body()).equals(PNG_1x1)).toBe(true);
	await page.getByRole('button', { name: 'Remove perch.png' }).click();
	await expect(photo).toHaveCount(0);

	// Output page: drawn points follow the pointer and the arrow keys; the level table downloads.
	await page.getByRole('link', { name: 'Perch glow' }).click();
	await page.getByLabel('Drawn points').check();
	const typed = page.getByLabel(/Points, one "level, duty" per line/);
	await expect(typed).toHaveValue('0, 0\n0.25, 0.02\n0.5, 0.15\n0.75, 0.45\n1, 1');
	const handle = page.getByRole('button', { name: /^Point 4 of 5/ });
	const box = (await handle.boundingBox())!;
	await page.mouse.move(box.x + box.width / 2, box.y + box.height / 2);
	await page.mouse.down();
	await page.mouse.move(box.x + box.width / 2, box.y - 30, { steps: 5 });
	await page.mouse.up();
	// Dragged up: its duty rose above 0.45 (and stays at most the next point's 1).
	await expect
		.poll(async () => Number((await typed.inputValue()).split('\n')[3].split(', ')[1]))
		.toBeGreaterThan(0.45);
	await page.getByRole('button', { name: /^Point 2 of 5/ }).press('ArrowUp');
	await expect(typed).toHaveValue(new RegExp(`^0, 0\n0\\.25, 0\\.03\n0\\.5, 0\\.15\n`));
	await page.getByRole('button', { name: 'Save curve' }).click();
	await expect(page.getByText('Curve saved.')).toBeVisible();
	await expect(page.getByTestId('flicker')).toContainText('IEEE 1789');
	const [download] = await Promise.all([
		page.waitForEvent('download'),
		page.getByRole('link', { name: 'Download C array (.h)' }).click()
	]);
	expect(download.suggestedFilename()).toBe('perch-glow-levels.h');
	const json = await (await page.request.get(page.url() + '/level-table.json')).json();
	expect(json.counts).toHaveLength(256);
	expect(json.counts[255]).toBe(255); // 8-bit PWM on the demo board
});

test('crew can read props but not change them', async ({ page }) => {
	await signIn(page, people.crew);
	await page.goto(`${TRAIL}/props`);
	await expect(page.getByRole('link', { name: 'Hand in the well' })).toBeVisible();
	await expect(page.getByRole('link', { name: 'New prop' })).toHaveCount(0);
	const res = await page.request.get(`${TRAIL}/props/new`);
	expect(res.status()).toBe(403);
	const api = await page.request.post(`/api/v/hollow-pines-trail/props`, {
		data: { name: 'Sneaky' }
	});
	expect(api.status()).toBe(403);
});
