import { json } from '@sveltejs/kit';
import { db } from '$lib/server/db';

export async function GET() {
	try {
		await db().raw('select 1');
		return json({ ok: true, db: 'up' });
	} catch {
		return json({ ok: false, db: 'down' }, { status: 503 });
	}
}
