/** Reviews, safety flags and the review desk (PRODUCT.md §4.5). */
export * from './state';
export * from './flags';
export * from './verdicts';
export * from './panel';
export * from './desk';
export * from './targets';
export * from './digest';
export * from './since';
export * from './pinned';
