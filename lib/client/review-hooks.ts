// Compatibility module: the hooks live one module per resource (review-requests.ts,
// signoffs.ts); this file only re-exports the names components imported from here before the split.
export { reviewQueueKey, reviewRequestsKey, useReviewQueue, useReviewRequests } from "./review-requests";
export { signoffKey, signoffsKey, useSignoffList } from "./signoffs";
