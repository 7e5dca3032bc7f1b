/** Reviews, safety flags and the review desk (PRODUCT.md §4.5). */
export * from './state';
