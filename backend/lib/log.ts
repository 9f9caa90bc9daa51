import type { Log } from "../deps";

/** Where log lines go: the process's console in `npm start`, a collector in tests. */
export type LogSink = {
  info: (line: string) => void;
  error: (line: string, err: unknown) => void;
};

/** The one place the server writes to the console. */
export const consoleSink: LogSink = {
  // eslint-disable-next-line no-console -- the server's log is its standard output
  info: (line) => console.info(line),
  // eslint-disable-next-line no-console -- errors go to standard error with their stack
  error: (line, err) => console.error(line, err),
};

/** A `Log` writing "[orthostack] message" lines to a sink; a message with an error is an error line. */
export function createLog(sink: LogSink): Log {
  return (message, err) => {
    if (err) sink.error(`[orthostack] ${message}`, err);
    else sink.info(`[orthostack] ${message}`);
  };
}
