/**
 * The request plumbing every route shares: the JSON error envelope and its one status → code table, the
 * API guard, the typed result of a form action's domain call, and the plumbing of upload/no-JS routes.
 */
export * from './envelope';
export * from './guard';
export * from './action';
export * from './upload';
