import type { SessionUser, SessionData } from '$lib/server/auth';

declare global {
	namespace App {
		interface Locals {
			user: SessionUser | null;
			session: SessionData | null;
			/** Set when PostgreSQL or the object store did not answer (the request ends in 503). */
			unavailable?: 'database' | 'storage';
		}
		interface Error {
			message: string;
			errorId?: string;
		}
	}
}

export {};
