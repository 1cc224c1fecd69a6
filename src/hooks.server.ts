import '$lib/schemas/messages';
import type { Handle, ServerInit } from '@sveltejs/kit';
import { sequence } from '@sveltejs/kit/hooks';
import { building } from '$app/environment';
import { handle as authHandle } from './auth';
import { checkConfig, config } from '$lib/server/config';
import { closeDb, db } from '$lib/server/db';
import { applyMigrations } from '$lib/server/migrate';
import { startMailQueue, stopMailQueue } from '$lib/server/mail/queue';
import { mailDomain, sendEnvelope } from '$lib/server/mail/transport';
import { startRunSheetSweep } from '$lib/server/runsheets/timer';
import { env } from '$env/dynamic/private';
import { objectStore } from '$lib/server/objects';
import { startObjectCleanup, stopObjectCleanup } from '$lib/server/object-cleanup';
import { startBoards } from '$lib/server/boards/service';
import { handleError } from '$lib/server/hooks/errors';
import { guardHandle } from '$lib/server/hooks/guard';
import { inputHandle } from '$lib/server/hooks/input';
import { personHandle } from '$lib/server/hooks/person';
import { themeHandle } from '$lib/server/hooks/theme';
import { venueHandle } from '$lib/server/hooks/venue';

export const init: ServerInit = async () => {
	if (building) return;
	checkConfig();
	await applyMigrations(db);
	const boss = await startMailQueue({
		connectionString: env.DATABASE_URL!,
		db,
		send: sendEnvelope,
		domain: mailDomain()
	});
	await startRunSheetSweep(boss, db, config.origin);
	await startObjectCleanup(boss, () => objectStore(env));
	const boards = await startBoards(db, config.mqttUrl, config.readingsRetentionDays);
	// node build waits for open pools on SIGTERM: close the queue, then the database.
	process.once('sveltekit:shutdown', () => {
		stopObjectCleanup();
		void boards
			.stop()
			.then(() => stopMailQueue())
			.finally(() => closeDb());
	});
};

/** Unexpected errors: logged with a short reference, answered in plain words. */
export { handleError };

export const handle: Handle = sequence(
	authHandle,
	personHandle,
	themeHandle,
	inputHandle,
	venueHandle,
	guardHandle
);
