/**
 * Lets the event loop serve what is waiting (other requests, timers) before going on. A request
 * whose stages are each a long run of synchronous work (parsing and checking about 1 MB of stack,
 * PGlite writing it on this same thread, serialising the answer) chains them as promise
 * continuations that never give the loop a turn, so everything else would wait for the sum of the
 * stages instead of the longest one.
 */
export const yieldToEventLoop = () => new Promise<void>((resolve) => setImmediate(resolve));
