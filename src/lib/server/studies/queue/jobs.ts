/**
 * The jobs a study is split into, and how long each may stay active before
 * the queue treats its worker as dead and hands the job to another.
 */
import type PgBoss from 'pg-boss';
import { MAIL_RETRY_LIMIT, MAIL_RETRY_SECONDS, RETRY_DELAY_SECONDS, RETRY_LIMIT, failedQueue, mailQueue } from './boss';

export type StudyJob =
	| { kind: 'audit'; studyId: string; fitId: string }
	/** every optimizer of the study from starts from … to − 1 on one fit */
	| { kind: 'runs'; studyId: string; fitId: string; from: number; to: number };

export type MailJob = { studyId: string; event: 'done' | 'failed' };

/** runs per job: small enough to spread over threads, big enough to keep queue and storage overhead low */
const RUNS_PER_JOB = 300;
export const startsPerJob = (optimizers: number) => Math.max(1, Math.floor(RUNS_PER_JOB / Math.max(1, optimizers)));
/** a runs job stores what it has and hands the rest to a new job after this long */
export const softSeconds = () => Number(process.env.KINKLESS_JOB_SOFT_SECONDS ?? 10);
const AUDIT_EXPIRE_SECONDS = 120;

/** A runs job never computes longer than the soft limit plus one run, so it can expire soon after its worker dies. */
export function runsExpireSeconds(maxMilliseconds: number): number {
	return Math.ceil(softSeconds() + (2 * maxMilliseconds) / 1000 + 10);
}

export function runsJob(queue: string, data: Extract<StudyJob, { kind: 'runs' }>, maxMilliseconds: number): PgBoss.JobInsert {
	return { name: queue, data, expireInSeconds: runsExpireSeconds(maxMilliseconds), retryLimit: RETRY_LIMIT, retryDelay: RETRY_DELAY_SECONDS, deadLetter: failedQueue(queue) };
}

export function auditJob(queue: string, data: Extract<StudyJob, { kind: 'audit' }>): PgBoss.JobInsert {
	// audits first: the scorecard needs them, and they are few
	return { name: queue, data, priority: 10, expireInSeconds: AUDIT_EXPIRE_SECONDS, retryLimit: RETRY_LIMIT, retryDelay: RETRY_DELAY_SECONDS, deadLetter: failedQueue(queue) };
}

/**
 * "Study finished" mail is retried with doubling delays (10 s, 20 s, … about 11 hours
 * in all), so an SMTP outage delays it rather than losing it. The SMTP timeouts
 * (mail.ts) are well inside the job's expiry, so a hanging server counts as a failure.
 */
const mailRetrySeconds = () => Number(process.env.KINKLESS_MAIL_RETRY_SECONDS ?? MAIL_RETRY_SECONDS);

export function mailJob(queue: string, data: MailJob): PgBoss.JobInsert {
	return { name: mailQueue(queue), data, retryLimit: MAIL_RETRY_LIMIT, retryDelay: mailRetrySeconds(), retryBackoff: true, expireInSeconds: 120 };
}
