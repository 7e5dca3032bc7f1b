/** Invented demo members, one or more per role. Passwords are for local use only. */
export const DEMO_PASSWORD = 'bench-demo-2026';

export const DEMO_MEMBERS = [
	{ key: 'admin', name: 'Ilse Varga', handle: 'ilse', email: 'ilse@starground.test', role: 'admin', bio: 'Keeps the site running. Builds test gear on weekends.' },
	{ key: 'moderator', name: 'Tomas Eberhart', handle: 'tomas', email: 'tomas@starground.test', role: 'moderator', bio: 'Valve amps, old meters, and a patient eye on the report queue.' },
	{ key: 'reviewer', name: 'Maren Quist', handle: 'maren', email: 'maren@starground.test', role: 'reviewer', bio: 'Power electronics technician. Reviews mains wiring and heatsinking.' },
	{ key: 'reviewer2', name: 'Oskar Lindqvist', handle: 'oskar', email: 'oskar@starground.test', role: 'reviewer', bio: 'Discrete class A and measurement nerd.' },
	{ key: 'maker', name: 'Joss Pelletier', handle: 'joss', email: 'joss@starground.test', role: 'maker', bio: 'First chip amp, second chip amp, now a headphone amp.' },
	{ key: 'maker2', name: 'Aiko Brandt', handle: 'aiko', email: 'aiko@starground.test', role: 'maker', bio: 'Speaker crossovers and passive preamps.' },
	{ key: 'maker3', name: 'Ravi Solberg', handle: 'ravi', email: 'ravi@starground.test', role: 'maker', bio: 'Linear supplies for everything.' }
] as const;

export type DemoMemberKey = (typeof DEMO_MEMBERS)[number]['key'];
