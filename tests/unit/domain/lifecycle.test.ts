// The domain's status and outcome lists against the migration's check
// constraints (common practice, no source: the same list in two places must agree).
import { readFileSync } from 'node:fs';
import { describe, expect, it } from 'vitest';
import { canTransition, isActive, STUDY_STATUSES, TRANSITIONS } from '../../../src/lib/domain/lifecycle';
import { OUTCOME_MEANINGS, OUTCOMES } from '../../../src/lib/domain/outcomes';

const migration = readFileSync(new URL('../../../migrations/20261202000003_studies.ts', import.meta.url), 'utf8');
const checkList = (name: string) => {
	const m = migration.match(new RegExp(`${name} CHECK \\(\\w+ IN \\(([^)]*)\\)\\)`));
	if (!m) throw new Error(`no check constraint ${name} in the studies migration`);
	return m[1].split(',').map((s) => s.trim().replace(/^'|'$/g, ''));
};

describe('study lifecycle', () => {
	it('has the statuses the database allows, in the same order', () => {
		expect(checkList('studies_status_check')).toEqual([...STUDY_STATUSES]);
	});
	it('calls exactly queued and running active', () => {
		expect(STUDY_STATUSES.filter(isActive)).toEqual(['queued', 'running']);
		expect(isActive(null)).toBe(false);
		expect(isActive('unknown')).toBe(false);
	});
	it('lets only active studies move, and never back to queued', () => {
		for (const s of STUDY_STATUSES) {
			expect(TRANSITIONS[s].length > 0).toBe(isActive(s));
			for (const t of STUDY_STATUSES) if (t === 'queued') expect(canTransition(s, t)).toBe(false);
		}
		expect(canTransition('queued', 'running')).toBe(true);
		expect(canTransition('done', 'running')).toBe(false);
	});
});

describe('run outcomes', () => {
	it('has the outcomes the database allows, each with a meaning', () => {
		expect(checkList('study_runs_outcome_check')).toEqual([...OUTCOMES]);
		expect(Object.keys(OUTCOME_MEANINGS)).toEqual([...OUTCOMES]);
		for (const o of OUTCOMES) expect(OUTCOME_MEANINGS[o].length).toBeGreaterThan(10);
	});
});
