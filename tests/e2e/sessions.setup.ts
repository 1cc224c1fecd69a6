import { test } from '@playwright/test';
import { people, sessionFile, signIn } from './support';

// Each demo role signs in once; page checks reuse the saved session.
for (const role of Object.keys(people) as (keyof typeof people)[]) {
	test(`${role} signs in`, async ({ page }) => {
		await signIn(page, people[role]);
		await page.context().storageState({ path: sessionFile(role) });
	});
}
