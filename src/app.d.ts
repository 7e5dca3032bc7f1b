import type { SessionUser, SessionData } from '$lib/server/auth';
import type { Build } from '$lib/server/db/schema';

declare global {
	namespace App {
		interface Locals {
			user: SessionUser | null;
			session: SessionData | null;
			/** Set when PostgreSQL or the object store did not answer (the request ends in 503). */
			unavailable?: 'database' | 'storage';
			/** The build row a build page's anonymous reader asked for, read once by the reader cache hook. */
			readerBuild?: Build;
		}
		interface Error {
			message: string;
			errorId?: string;
		}
	}
}

export {};
