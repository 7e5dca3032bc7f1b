import type { SessionUser, SessionData } from '$lib/server/auth';

declare global {
	namespace App {
		interface Locals {
			user: SessionUser | null;
			session: SessionData | null;
		}
		interface Error {
			message: string;
			errorId?: string;
		}
	}
}

export {};
