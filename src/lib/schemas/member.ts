import { z } from 'zod';
import { ROLES } from '$lib/roles';
import { emailField } from './auth';

const roleField = z.enum(ROLES, { error: 'Choose a role.' });

export const inviteSchema = z.object({ email: emailField, role: roleField });
export const changeRoleSchema = z.object({
	id: z.uuid('That member does not exist.'),
	role: roleField
});
export const memberIdSchema = z.object({ id: z.uuid('That member does not exist.') });
export const invitationIdSchema = z.object({ id: z.uuid('That invitation does not exist.') });
