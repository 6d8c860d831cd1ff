/**
 * How an optimizer run can end, and what each ending means (shown on the
 * study pages). The optimizers, the scorecard, the charts and the database's
 * check constraint use this one list.
 */

export const OUTCOMES = ['converged', 'stalled', 'iteration-limit', 'left-domain', 'diverged'] as const;
export type Outcome = (typeof OUTCOMES)[number];

export const OUTCOME_MEANINGS: Readonly<Record<Outcome, string>> = {
	converged: 'the slope fell to the gradient tolerance (relative to the slope at the start) and the point passed the second-order check',
	stalled: 'stopped making progress before the tolerance',
	'iteration-limit': 'ran out of iterations, evaluations or time',
	'left-domain': 'asked for a point outside the data under the refuse rule',
	diverged: 'ran off to infinity, reached a value that is not a finite number, or broke down'
};
