import { pg } from '$lib/server/db';
import { createLiveHub } from './live';

/** This app server's one listener for checklist changes. */
export const liveHub = createLiveHub(pg);
