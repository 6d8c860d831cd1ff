// The new-study form's own labels for the field paths the server names in its
// problems ("problem.bounds.0" → "Lower and upper bound on J"), so a refused
// form speaks the words on the screen, never internal paths.

const BUDGETS: Record<string, string> = { maxIterations: 'Iterations per run', maxEvaluations: 'Evaluations per run', maxMilliseconds: 'Milliseconds per run' };

export function studyFieldLabel(field: string | undefined, ctx: { input?: string; fits?: string[]; optimizers?: string[] } = {}): string {
	const input = ctx.input ?? 'the input';
	const p = (field ?? '').split('.');
	switch (p[0]) {
		case '':
		case '(body)':
			return 'The form';
		case 'source':
		case 'datasetId':
		case 'output':
			return 'Dataset and output';
		case 'name':
			return 'Study name';
		case 'extrapolation':
			return 'Outside the data';
		case 'problem':
			if (p[1] === 'bounds') return p[3] === '0' ? `Lower bound on ${input}` : p[3] === '1' ? `Upper bound on ${input}` : `Lower and upper bound on ${input}`;
			if (p[1] === 'target') return 'Target value';
			if (p[1] === 'kind') return 'Problem';
			if (p[1] === 'constraints') return p[2] !== undefined ? `Constraint ${Number(p[2]) + 1}` : 'Constraints on other outputs';
			return 'Problem';
		case 'starts':
			if (p[1] === 'points') return p[2] !== undefined ? `Start values (value ${Number(p[2]) + 1})` : 'Start values';
			if (p[1] === 'seed') return 'Seed';
			if (p[1] === 'latinHypercube' || p[1] === 'grid') return 'Number of starts';
			return 'Starts';
		case 'budgets':
			return BUDGETS[p[1]] ?? 'Budgets per run';
		case 'optimizers': {
			const name = p[1] !== undefined ? ctx.optimizers?.[Number(p[1])] : undefined;
			if (p[3] === 'gradTol') return 'Gradient tolerance';
			if (p[3] && BUDGETS[p[3]]) return BUDGETS[p[3]];
			return name ? `Optimizers (${name})` : 'Optimizers';
		}
		case 'fits': {
			const name = p[1] !== undefined ? ctx.fits?.[Number(p[1])] : undefined;
			if (p[2] === 'options' && p[3]) return `${name ?? 'Fit'}: ${p[3]}`;
			return name ? `Fits to compare (${name})` : 'Fits to compare';
		}
		case 'fitId':
			return 'Fit';
		case 'rationale':
			return 'Rationale';
		default:
			return field ?? 'The form';
	}
}
