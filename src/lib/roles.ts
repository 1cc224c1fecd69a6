/** The four roles a person can hold in a venue, in the words the product uses. */
export const ROLES = ['owner', 'designer', 'show_manager', 'crew'] as const;
export type Role = (typeof ROLES)[number];

export const ROLE_LABELS: Record<Role, string> = {
	owner: 'Owner',
	designer: 'Designer',
	show_manager: 'Show manager',
	crew: 'Crew'
};

export function isRole(value: unknown): value is Role {
	return typeof value === 'string' && (ROLES as readonly string[]).includes(value);
}
