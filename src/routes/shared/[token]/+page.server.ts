import { CAUTION } from '$lib/caution';
import { db } from '$lib/server/db';
import { sharedStudy } from '$lib/server/studies/access';
import { RANK_RULE } from '$lib/server/studies/scorecard';
import { studyPage } from '$lib/server/studies/view';
import type { PageServerLoad } from './$types';

// Read-only, no sign-in: the token is checked on every request, so a revoked link stops at once.
export const load = (async ({ params, setHeaders }) => {
	const study = await sharedStudy(params.token);
	setHeaders({ 'referrer-policy': 'no-referrer', 'cache-control': 'no-store' });
	const page = await studyPage(db(), study);
	// member names are already removed by sharedStudy unless the owner chose to show them
	return { ...page, token: params.token, caution: CAUTION, rankRule: RANK_RULE };
}) satisfies PageServerLoad;
