// The demo accounts as printed by `npm start` (kept in step with src/lib/server/seed/members.ts by a test).
export const DEMO_ACCOUNTS = {
	password: 'bench-demo-2026',
	members: [
		{ role: 'admin', email: 'ilse@starground.test' },
		{ role: 'moderator', email: 'tomas@starground.test' },
		{ role: 'reviewer', email: 'maren@starground.test' },
		{ role: 'reviewer', email: 'oskar@starground.test' },
		{ role: 'maker', email: 'joss@starground.test' },
		{ role: 'maker', email: 'aiko@starground.test' },
		{ role: 'maker', email: 'ravi@starground.test' }
	]
};
