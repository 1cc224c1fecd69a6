import { invalidateAll } from '$app/navigation';
import { navigating } from '$app/state';

/**
 * Reload the page's data for a live update, unless the person is leaving the page: a reload then
 * would cancel the link they just pressed. Says whether it reloaded.
 */
export async function refreshUnlessLeaving(): Promise<boolean> {
	if (navigating.to) return false;
	await invalidateAll();
	return true;
}
