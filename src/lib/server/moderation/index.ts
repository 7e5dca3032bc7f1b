/**
 * Moderation (PRODUCT.md §4.6): the acts every screen calls (./acts: hide, lock, suspend, role change,
 * close a report — each one transaction with its audit entry and the reports it settles), and reports
 * with the desk's and the audit log's reads (./reports).
 */
export * from './acts';
export * from './reports';
