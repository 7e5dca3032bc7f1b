/**
 * Builds: the maker's journal (PRODUCT.md §4.2, §4.7). Create, edit, publish, archive; steps; revisions;
 * derive; the list query (./list) and the API's JSON (./serialize); reads for pages. Writes accept an
 * optional transaction (`tx`).
 */
export * from './access';
export * from './slug';
export * from './snapshot';
export * from './revisions';
export * from './edit';
export * from './steps';
export * from './derive';
export * from './queries';
export * from './list';
export * from './serialize';
export * from './editable';
export * from './revision-diff';
export * from './published';
