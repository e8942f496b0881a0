/**
 * How many server processes are serving, as the primary process counts them
 * (server.ts with WEB_CONCURRENCY above 1): it tells every process the count
 * whenever a process starts listening or exits. A process started on its own
 * is the only one.
 */

/** The message the primary sends its server processes. */
export interface ServingCountMessage {
  type: "joulebook:serving-processes";
  count: number;
}

export function isServingCountMessage(
  message: unknown,
): message is ServingCountMessage {
  return (
    typeof message === "object" &&
    message !== null &&
    (message as ServingCountMessage).type === "joulebook:serving-processes" &&
    Number.isInteger((message as ServingCountMessage).count)
  );
}
