// Words of the account that pages in the browser show. Kept apart from the account itself, whose amount checks
// bring in the shop policy and its schemas: a page that only prints these words does not load them.

/** How a waived remainder is named to the owner and the office. */
export const WAIVED_WORDING = "waived, below the smallest card payment";
