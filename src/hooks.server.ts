import type { Handle, ServerInit } from '@sveltejs/kit';
import { sequence } from '@sveltejs/kit/hooks';
import { building } from '$app/environment';
import { handle as authHandle } from './auth';
import { checkConfig } from '$lib/server/config';
import { closeDb, db } from '$lib/server/db';
import { applyMigrations } from '$lib/server/migrate';
import { guardHandle } from '$lib/server/hooks/guard';
import { personHandle } from '$lib/server/hooks/person';
import { themeHandle } from '$lib/server/hooks/theme';
import { venueHandle } from '$lib/server/hooks/venue';

export const init: ServerInit = async () => {
	if (building) return;
	checkConfig();
	await applyMigrations(db);
	process.once('sveltekit:shutdown', () => void closeDb());
};

export const handle: Handle = sequence(
	authHandle,
	personHandle,
	themeHandle,
	venueHandle,
	guardHandle
);
