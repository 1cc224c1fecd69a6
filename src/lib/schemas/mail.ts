import { z } from 'zod';

export const resendSchema = z.object({ id: z.uuid('That message does not exist.') });
