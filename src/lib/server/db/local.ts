/** Whether a connection URL points at this machine (the only place demo data may go by default). */
export function isLocalDatabaseUrl(url: string): boolean {
	try {
		const host = new URL(url).hostname;
		return ['127.0.0.1', 'localhost', '::1', '[::1]'].includes(host);
	} catch {
		return false;
	}
}
