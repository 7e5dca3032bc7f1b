/**
 * Builds: the maker's journal (PRODUCT.md §4.2, §4.7). Create, edit, publish, archive, lock; steps;
 * revisions; derive; reads for pages and the API. Writes accept an optional transaction (`tx`).
 */
export * from './access';
export * from './slug';
export * from './snapshot';
export * from './search';
export * from './revisions';
export * from './edit';
export * from './steps';
export * from './derive';
export * from './queries';
export * from './api';
export * from './editable';
export * from './revision-diff';
