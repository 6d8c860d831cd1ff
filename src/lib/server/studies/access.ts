// A study's access follows its workspace: non-members get 404 (a study's
// existence does not leak), members below the role get 403.
import { isHttpError } from '@sveltejs/kit';
import type { Role } from '../../schemas';
import { workspaceAccessById, requireUser, type Access } from '../workspaces/access';
import { fail4xx } from '../api';
import { db } from '../db';
import * as store from './store';

export async function studyAccess(locals: App.Locals, id: string, need: Role = 'viewer'): Promise<{ study: store.Study; access: Access }> {
	requireUser(locals);
	const study = await store.get(db(), id);
	if (!study) fail4xx(404, 'no such study');
	try {
		const access = await workspaceAccessById(locals, study.workspaceId, need);
		return { study, access };
	} catch (e) {
		if (isHttpError(e) && e.status === 404) fail4xx(404, 'no such study');
		throw e;
	}
}

/**
 * A study opened through a share link; revoked or expired links are 404 on the
 * very next request. Member names (who launched it, who picked its fit) are
 * removed here, for every page and API behind the token, unless the owner
 * chose to show them on this link.
 */
export async function sharedStudy(token: string): Promise<store.Study> {
	const share = await store.shareForToken(db(), token);
	const study = share ? await store.get(db(), share.studyId) : null;
	if (!share || !study) fail4xx(404, 'this link is not valid: it was revoked, it expired, or it never existed');
	return share.showNames ? study : withoutMemberNames(study);
}

/** The study as a link holder sees it by default: no member names or ids. */
function withoutMemberNames(study: store.Study): store.Study {
	return { ...study, createdBy: null, pick: study.pick ? { ...study.pick, by: null } : null };
}
