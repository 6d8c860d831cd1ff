// Outgoing e-mail through nodemailer over SMTP. Without SMTP_URL, messages go to
// a local catcher (smtp-server on loopback) that stores them in PostgreSQL, where
// /dev/mail shows each signed-in user the ones addressed to them (see mailViewerEnabled).
import nodemailer, { type Transporter } from 'nodemailer';
import { SMTPServer } from 'smtp-server';
import { simpleParser } from 'mailparser';
import { db } from './db';

const FROM = process.env.MAIL_FROM ?? 'Kinkless <no-reply@kinkless.localhost>';
let transporter: Transporter | null = null;
let catcher: SMTPServer | null = null;

const catchingMail = () => !process.env.SMTP_URL;

const LOOPBACK = new Set(['127.0.0.1', 'localhost', '[::1]', '::1']);

/**
 * The caught-mail viewer (/dev/mail) is a development tool. It is on only when
 * every one of these holds: mail is caught (no SMTP_URL), NODE_ENV is not
 * `production`, the app was started for local use by `npm start`, `npm run dev`
 * or `npm test` (they set KINKLESS_LOCAL=1), and the public origin is a loopback
 * address. Even then it shows a signed-in user only the mail addressed to them.
 */
export function mailViewerEnabled(env: NodeJS.ProcessEnv = process.env): boolean {
	if (env.SMTP_URL || env.NODE_ENV === 'production' || env.KINKLESS_LOCAL !== '1') return false;
	try {
		return LOOPBACK.has(new URL(env.ORIGIN ?? 'http://127.0.0.1').hostname);
	} catch {
		return false;
	}
}
const catcherPort = () => Number(process.env.SMTP_CATCHER_PORT ?? 2525);

function transport(): Transporter {
	transporter ??= process.env.SMTP_URL
		? // timeouts well inside a mail job's expiry: a hanging server fails the attempt, which is retried
			nodemailer.createTransport({ url: process.env.SMTP_URL, connectionTimeout: 15_000, greetingTimeout: 15_000, socketTimeout: 30_000 })
		: nodemailer.createTransport({ host: '127.0.0.1', port: catcherPort(), secure: false, ignoreTLS: true });
	return transporter;
}

export async function send(message: { to: string; subject: string; text: string; html?: string }): Promise<void> {
	await startCatcher();
	await transport().sendMail({ from: FROM, ...message });
}

/** Start the loopback catcher once per process (no-op when SMTP_URL is set). */
export function startCatcher(): Promise<void> {
	if (!catchingMail() || catcher) return Promise.resolve();
	const server = new SMTPServer({
		authOptional: true,
		disabledCommands: ['STARTTLS', 'AUTH'],
		banner: 'Kinkless local mail catcher',
		size: 10 * 1024 * 1024,
		onData(stream, session, callback) {
			const chunks: Buffer[] = [];
			stream.on('data', (c: Buffer) => chunks.push(c));
			stream.on('end', async () => {
				try {
					const raw = Buffer.concat(chunks);
					const parsed = await simpleParser(raw);
					await db()('caught_mail').insert({
						mail_from: session.envelope.mailFrom ? session.envelope.mailFrom.address : '',
						rcpt_to: session.envelope.rcptTo.map((r) => r.address.toLowerCase()),
						subject: parsed.subject ?? '',
						text: parsed.text ?? '',
						html: typeof parsed.html === 'string' ? parsed.html : null,
						raw: raw.toString('utf8')
					});
					callback();
				} catch (e) {
					callback(e as Error);
				}
			});
		}
	});
	catcher = server;
	return new Promise((resolve, reject) => {
		server.once('error', (e: NodeJS.ErrnoException) => {
			// Another process of ours (a second server, a worker) already catches on this port.
			if (e.code === 'EADDRINUSE') resolve();
			else reject(e);
		});
		server.listen(catcherPort(), '127.0.0.1', () => resolve());
	});
}

/** Caught messages addressed to `email` (never anyone else's), newest first. */
export const listCaughtFor = (email: string, limit = 100) =>
	db()('caught_mail')
		.whereRaw('? = ANY(rcpt_to)', [email.trim().toLowerCase()])
		.orderBy('id', 'desc')
		.limit(limit).select<{ id: number; received_at: Date; mail_from: string; rcpt_to: string[]; subject: string; text: string }[]>('id', 'received_at', 'mail_from', 'rcpt_to', 'subject', 'text');

function escapeHtml(s: string): string {
	return s.replace(/[&<>"']/g, (c) => ({ '&': '&amp;', '<': '&lt;', '>': '&gt;', '"': '&quot;', "'": '&#39;' })[c]!);
}

/** Plain, brand-consistent e-mail with one call to action. */
export function actionMail(opts: { to: string; subject: string; intro: string; actionLabel: string; url: string; outro?: string }) {
	const text = `${opts.intro}\n\n${opts.actionLabel}: ${opts.url}\n\n${opts.outro ?? ''}\n— Kinkless`;
	const html = `<p>${escapeHtml(opts.intro)}</p><p><a href="${escapeHtml(opts.url)}">${escapeHtml(opts.actionLabel)}</a></p><p>${escapeHtml(opts.outro ?? '')}</p><p>— Kinkless</p>`;
	return send({ to: opts.to, subject: opts.subject, text, html });
}
