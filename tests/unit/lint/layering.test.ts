import { ESLint } from 'eslint';
import { describe, expect, it } from 'vitest';

// The layering rules in eslint.config.js, shown to bite: the same deliberate import is
// an error inside src/lib/numerics or src/lib/domain and allowed in src/lib/server.
const eslint = new ESLint({ cwd: process.cwd() });

async function restricted(filePath: string, code: string): Promise<string[]> {
	const [result] = await eslint.lintText(code, { filePath });
	return result.messages.filter((m) => m.ruleId === 'no-restricted-imports' || m.ruleId === 'no-restricted-globals').map((m) => m.message);
}

const SERVER_IMPORT = "import { db } from '$lib/server/db';\nexport const handle = db;\n";
const RELATIVE_SERVER_IMPORT = "import { db } from '../server/db';\nexport const handle = db;\n";

describe('layering lint rules', () => {
	it('refuse a server import inside numerics and domain, by alias or relative path', async () => {
		for (const file of ['src/lib/numerics/fits/lintFixture.ts', 'src/lib/domain/lintFixture.ts']) {
			// both rules apply: the alias, and the server
			expect(await restricted(file, SERVER_IMPORT), file).toEqual([expect.stringMatching(/relative imports only/), expect.stringMatching(/import nothing from the server/)]);
			expect(await restricted(file, RELATIVE_SERVER_IMPORT), file).toEqual([expect.stringMatching(/import nothing from the server/)]);
			expect(await restricted(file, "import { error } from '@sveltejs/kit';\nexport const e = error;\n"), file).toHaveLength(1);
			expect(await restricted(file, 'export const w = () => document.title;\n'), file).toEqual([expect.stringMatching(/numerics and domain run without a DOM/)]);
		}
	}, 60_000);

	it('refuse the $lib alias in code worker threads load, and allow both elsewhere on the server', async () => {
		expect(await restricted('src/lib/server/studies/lintFixture.ts', SERVER_IMPORT)).toEqual([expect.stringMatching(/worker threads/)]);
		expect(await restricted('src/lib/server/lintFixture.ts', SERVER_IMPORT)).toEqual([]);
		expect(await restricted('src/lib/numerics/fits/lintFixture.ts', "import { OUTCOMES } from '../../domain/outcomes';\nexport const o = OUTCOMES;\n")).toEqual([]);
	}, 60_000);
});
