import { SMTPServer } from 'smtp-server';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { Client, freePort, json, secondServer, testDb, uniqueEmail } from './client';
import { PROP } from './studiesFixtures';

// A "study finished" e-mail sent while the SMTP server is down is retried, not dropped:
// a second server with SMTP_URL at a port nothing listens on (its own queue, retries
// 1 s apart for the test); the SMTP server comes up after the first failure and the
// message arrives.
const queue = `mailretry${Date.now()}`;
let smtpPort = 0;
let server: { base: string; stop: () => void };
let smtp: SMTPServer | null = null;
const received: { to: string[]; text: string }[] = [];

beforeAll(async () => {
	smtpPort = await freePort();
	server = await secondServer({ SMTP_URL: `smtp://127.0.0.1:${smtpPort}`, KINKLESS_QUEUE: queue, KINKLESS_MAIL_RETRY_SECONDS: '1', KINKLESS_WORKERS: '1' });
}, 30_000);
afterAll(() => {
	server?.stop();
	smtp?.close();
});

describe('study-finished mail while SMTP is down', () => {
	it('is retried until the SMTP server is back, then delivered', { timeout: 90_000 }, async () => {
		const c = new Client(server.base);
		const email = uniqueEmail('mailretry');
		expect((await c.post('/api/v1/users', { email, password: 'correct-horse-battery', name: 'Mail retry' })).status).toBe(201);
		expect((await c.post('/api/v1/session', { email, password: 'correct-horse-battery' })).status).toBe(200);
		const ws = await json<{ slug: string }>(await c.post('/api/v1/workspaces', { name: 'Mail retry' }));
		const ds = await json<{ id: string }>(await c.post(`/api/v1/workspaces/${ws.slug}/datasets`, PROP));
		const launched = await c.post(`/api/v1/workspaces/${ws.slug}/studies`, {
			name: 'Mail retry',
			datasetId: ds.id,
			output: 'eta',
			problem: { kind: 'maximize' },
			fits: [{ method: 'pchip' }],
			optimizers: [{ method: 'bfgs' }],
			starts: { latinHypercube: 2, seed: 1 }
		});
		expect(launched.status).toBe(202);
		const studyId = (await json<{ id: string }>(launched)).id;

		// wait until the mail job has failed at least once (state 'retry')
		const mailJob = () => testDb().raw(`SELECT state::text AS state, retry_count FROM pgboss.job WHERE name = ? AND data->>'studyId' = ?`, [`${queue}-mail`, studyId]).then((r) => r.rows[0] as { state: string; retry_count: number } | undefined);
		let job = await mailJob();
		for (let i = 0; i < 300 && !(job && job.retry_count >= 1); i++) {
			await new Promise((r) => setTimeout(r, 100));
			job = await mailJob();
		}
		expect(job?.retry_count).toBeGreaterThanOrEqual(1);
		expect(job?.state).not.toBe('failed');

		smtp = new SMTPServer({
			authOptional: true,
			disabledCommands: ['STARTTLS', 'AUTH'],
			onData(stream, session, callback) {
				let text = '';
				stream.on('data', (d: Buffer) => (text += d.toString('utf8')));
				stream.on('end', () => {
					received.push({ to: session.envelope.rcptTo.map((r) => r.address), text });
					callback();
				});
			}
		});
		await new Promise<void>((resolve) => smtp!.listen(smtpPort, '127.0.0.1', () => resolve()));
		for (let i = 0; i < 400 && !received.length; i++) await new Promise((r) => setTimeout(r, 100));
		expect(received).toHaveLength(1);
		expect(received[0].to).toEqual([email]);
		expect(received[0].text).toContain('Study finished: Mail retry');
		expect((await mailJob())?.state).toBe('completed');
	});
});
