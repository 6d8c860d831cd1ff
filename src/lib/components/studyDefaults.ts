// The new-study form's first guess at the problem, read from the dataset's own
// description ("Solve for the charge at the 300 V cut-off", "Minimise drag"),
// so a first study asks what the data were recorded for rather than pinning a
// maximum at a bound. Only a default: every field stays the user's to change.

interface ProblemGuess {
	kind: 'maximize' | 'minimize' | 'solve';
	/** the target of a solve, when the description names one */
	target: string | null;
}

export function guessProblem(description: string | null | undefined): ProblemGuess {
	const d = description ?? '';
	const solve = /\bsolv(e|ing)\b[^.]*?\bat (?:the |a |an )?(-?\d[\d,]*(?:\.\d+)?)/i.exec(d);
	if (solve) return { kind: 'solve', target: solve[2].replace(/,/g, '') };
	const first = (re: RegExp) => {
		const m = re.exec(d);
		return m ? m.index : Infinity;
	};
	const min = first(/\bminimi[sz](e|ing)\b|\bminimum\b|\blowest\b/i);
	const max = first(/\bmaximi[sz](e|ing)\b|\bmaximum\b|\bpeak\b|\bhighest\b/i);
	const solveWord = first(/\bsolv(e|ing)\b/i);
	const best = Math.min(min, max, solveWord);
	if (best === Infinity) return { kind: 'maximize', target: null };
	return { kind: best === min ? 'minimize' : best === max ? 'maximize' : 'solve', target: null };
}
