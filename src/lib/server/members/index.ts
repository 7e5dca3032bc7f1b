/**
 * Members (PRODUCT.md §2): signing in and up (./account, over better-auth in ../auth), the members list
 * moderators work from (./list), public maker profiles (./makers) and a member's own profile settings and
 * avatar (./profile). Role changes and suspension are moderation acts (../moderation).
 */
export * from './account';
export * from './list';
export * from './makers';
export * from './profile';
