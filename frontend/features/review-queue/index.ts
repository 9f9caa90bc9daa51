/** What other parts of the client use of the review queue: the home page's list and the counts. */
export { reviewQueueKey, reviewQueueQueryOptions, useReviewQueue } from "./api/review-queue";
export { WaitingList } from "./components/waiting-list";
