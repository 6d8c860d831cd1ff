// One zod schema per input, shared by the form actions and the JSON routes.
import { z } from 'zod';

export const ROLES = ['owner', 'editor', 'viewer'] as const;
export type Role = (typeof ROLES)[number];

const email = z
	.string({ error: 'e-mail is required' })
	.trim()
	.toLowerCase()
	.max(254, { error: 'e-mail is longer than 254 characters' })
	.pipe(z.email({ error: 'that is not a valid e-mail address' }));
export const newPassword = z
	.string({ error: 'password is required' })
	.min(10, { error: 'password must be at least 10 characters' })
	.max(256, { error: 'password must be at most 256 characters' });

export const signUpSchema = z.object({
	email,
	password: newPassword,
	name: z.string().trim().min(1, { error: 'name is required' }).max(120, { error: 'name must be at most 120 characters' })
});
export const signInSchema = z.object({
	email,
	password: z.string({ error: 'password is required' }).min(1, { error: 'password is required' }).max(256, { error: 'password must be at most 256 characters' })
});
export const resetRequestSchema = z.object({ email });
export const workspaceCreateSchema = z.object({
	name: z.string().trim().min(2, { error: 'workspace name must be at least 2 characters' }).max(80, { error: 'workspace name must be at most 80 characters' })
});
export const roleSchema = z.enum(ROLES, { error: 'role must be owner, editor or viewer' });
export const inviteSchema = z.object({ email, role: roleSchema });
export const memberRoleSchema = z.object({ userId: z.string().min(1).max(100), role: roleSchema });
export const memberRemoveSchema = z.object({ userId: z.string().min(1).max(100) });
export const tokenCreateSchema = z.object({
	name: z.string().trim().min(1, { error: 'token name is required' }).max(80, { error: 'token name must be at most 80 characters' })
});
export const passwordChangeSchema = z.object({
	current: z.string({ error: 'current password is required' }).min(1, { error: 'current password is required' }).max(256, { error: 'password must be at most 256 characters' }),
	password: newPassword
});
export const emailChangeSchema = z.object({
	current: z.string({ error: 'current password is required' }).min(1, { error: 'current password is required' }).max(256, { error: 'password must be at most 256 characters' }),
	email
});
export const profileSchema = z.object({
	name: z.string().trim().min(1, { error: 'name is required' }).max(120, { error: 'name must be at most 120 characters' })
});

/** zod issues → the API's `details` entries. */
export function zodDetails(error: z.ZodError): { field: string; problem: string }[] {
	return error.issues.map((i) => ({ field: i.path.join('.') || '(body)', problem: i.message }));
}
