/**
 * A study's lifecycle: its statuses, the moves between them, and which
 * statuses still have work to do. Plain TypeScript with relative imports only
 * (pages, the server and worker threads all load it).
 */

export const STUDY_STATUSES = ['queued', 'running', 'done', 'failed', 'cancelled'] as const;
export type StudyStatus = (typeof STUDY_STATUSES)[number];

/** statuses with runs still to do: a worker may take the study, a reader sees live progress */
export const ACTIVE_STATUSES = ['queued', 'running'] as const satisfies readonly StudyStatus[];

/** the moves a study may make; the ended statuses make none */
export const TRANSITIONS: Readonly<Record<StudyStatus, readonly StudyStatus[]>> = {
	queued: ['running', 'failed', 'cancelled'],
	running: ['done', 'failed', 'cancelled'],
	done: [],
	failed: [],
	cancelled: []
};

type ActiveStatus = (typeof ACTIVE_STATUSES)[number];

/** the one test of "still has work to do" */
export const isActive = (status: string | null | undefined): status is ActiveStatus => (ACTIVE_STATUSES as readonly string[]).includes(status ?? '');

export const canTransition = (from: StudyStatus, to: StudyStatus): boolean => TRANSITIONS[from].includes(to);
