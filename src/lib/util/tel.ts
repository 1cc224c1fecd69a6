/**
 * A `tel:` address for a phone number as people type it ("+1 (555) 010-4477", "0161 496 0000"):
 * digits and a leading plus only (RFC 3966 lets the visual separators go). Null when there are
 * too few digits to dial.
 */
export function telHref(phone: string | null | undefined): string | null {
	if (!phone) return null;
	const plus = phone.trim().startsWith('+') ? '+' : '';
	const digits = phone.replace(/\D/g, '');
	return digits.length >= 3 ? `tel:${plus}${digits}` : null;
}
