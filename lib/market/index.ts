// The market room: listings and their moderation, the search, card checkout and what follows it
// (purchases, refunds, reconciliation, webhooks), the library, reviews, sales and payouts, and the
// background jobs that build listing pictures and packages. Server code, except types.ts,
// vocabulary.ts and validation.ts (shapes, words and rules the pages share).
export * from './types';
export * from './vocabulary';
export * from './validation';
export * from './errors';
export * from './fees';
export * from './listings';
export * from './search';
export * from './listing-facts';
export * from './licences';
export * from './library';
export * from './reviews';
export * from './sales';
export * from './payouts';
export * from './payments/checkout';
export * from './payments/purchases';
export * from './payments/refunds';
export * from './payments/refund-requests';
export * from './payments/reconcile';
export * from './payments/webhooks';
export * from './fitting';
export * from './jobs';
export * from './workers';
