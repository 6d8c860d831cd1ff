import type { Role } from '$lib/schemas';
import type { Access } from './access';
import { db } from '../db';
import { actionMail } from '../mail';
import * as workspaces from './store';

/** Owners invite by e-mail with a role; the link works once, for seven days. */
export async function inviteMember(access: Access, email: string, role: Role, origin: string): Promise<void> {
	const token = await workspaces.invite(db(), access.workspace.id, access.user.id, email, role);
	await actionMail({
		to: email,
		subject: `${access.user.name} invited you to ${access.workspace.name} on Kinkless`,
		intro: `${access.user.name} (${access.user.email}) invited you to the workspace "${access.workspace.name}" as ${role}. Kinkless is where the team picks and records smooth fits of its engineering tables.`,
		actionLabel: 'Accept the invitation',
		url: `${origin}/invite/${token}`,
		outro: 'The link works once, for seven days. If you do not know the sender, ignore this message.'
	});
}
