// ?fitId=&optimizer=&limit=&offset= on the runs lists, checked.
import { isUuid } from '../../text';
import { fail4xx } from '../api';
import type { Study } from './store';

export function runsFilter(url: URL, study: Study): { fitId?: string; optimizer?: number; limit?: number; offset?: number } {
	const q = url.searchParams;
	const out: { fitId?: string; optimizer?: number; limit?: number; offset?: number } = {};
	const fitId = q.get('fitId');
	if (fitId) {
		if (!isUuid(fitId)) fail4xx(422, 'fitId must be one of this study’s fit ids', 'invalid', [{ field: 'fitId', problem: 'not a fit id' }]);
		out.fitId = fitId;
	}
	const int = (name: 'optimizer' | 'limit' | 'offset', max: number) => {
		const v = q.get(name);
		if (v === null || v === '') return;
		const n = Number(v);
		if (!Number.isInteger(n) || n < 0 || n > max) fail4xx(422, `${name} must be a whole number from 0 to ${max}`, 'invalid', [{ field: name, problem: `must be a whole number from 0 to ${max}` }]);
		out[name] = n;
	};
	int('optimizer', study.spec.optimizers.length - 1);
	int('limit', 100_000);
	int('offset', 100_000);
	return out;
}
