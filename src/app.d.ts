// See https://svelte.dev/docs/kit/types#app.d.ts
declare global {
	namespace App {
		interface Error {
			code?: string;
			message: string;
		}
		interface Locals {
			user: import('lucia').User | null;
			session: import('lucia').Session | null;
			/** set when the request was authenticated by an API token rather than a cookie */
			viaToken: boolean;
			/** set by handleError when a load could not reach the database (the answer becomes 503) */
			databaseDown: boolean;
		}
	}
}

export {};
