/**
 * How a fake run as a script (by `npm start` or `npm run dev`, through
 * `start_local_fakes` in scripts/lib.sh) takes its port, so that two
 * checkouts never share one fake:
 *
 * - `<portVariable>` set (RESEND_FAKE_PORT, STRIPE_FAKE_PORT): exactly that
 *   port, or the process exits with the reason;
 * - else `FAKE_PREFERRED_PORT` (the port this checkout recorded last time):
 *   that port when it is free, any free port when something else holds it;
 * - else any free port.
 *
 * Binding is the test of "free", so nothing can take the port between a
 * check and the bind. Once listening, the fake writes its port to
 * `FAKE_READY_FILE`; the shell waits for that file before it starts the
 * server and records the port for the next run.
 */
import { renameSync, writeFileSync } from "node:fs";
import { z } from "zod";

const NOT_A_PORT = "is not a port number (0 to 65535)";
const portSchema = z.coerce
  .number({ error: NOT_A_PORT })
  .int(NOT_A_PORT)
  .min(0, NOT_A_PORT)
  .max(65535, NOT_A_PORT);

export interface ListeningFake {
  port: number;
}

function parsePort(name: string, value: string | undefined) {
  if (value === undefined || value.trim() === "") return undefined;
  const parsed = portSchema.safeParse(value);
  if (!parsed.success)
    throw new Error(`${name}=${value} ${parsed.error.issues[0]?.message}`);
  return parsed.data;
}

function isAddressInUse(error: unknown) {
  return (error as NodeJS.ErrnoException | undefined)?.code === "EADDRINUSE";
}

export async function listenAsScript<T extends ListeningFake>(
  label: string,
  portVariable: string,
  listen: (port: number) => Promise<T>,
  env: NodeJS.ProcessEnv = process.env,
): Promise<T> {
  const explicit = parsePort(portVariable, env[portVariable]);
  const preferred = parsePort("FAKE_PREFERRED_PORT", env.FAKE_PREFERRED_PORT);
  let running: T;
  if (explicit !== undefined) {
    running = await listen(explicit).catch((error: unknown) => {
      throw isAddressInUse(error)
        ? new Error(
            `${portVariable}=${explicit}: port ${explicit} on 127.0.0.1 is already in use`,
          )
        : error;
    });
  } else if (preferred !== undefined) {
    running = await listen(preferred).catch((error: unknown) => {
      if (!isAddressInUse(error)) throw error;
      console.log(
        `[${label}] port ${preferred} is taken by another program; choosing a free one`,
      );
      return listen(0);
    });
  } else {
    running = await listen(0);
  }
  if (env.FAKE_READY_FILE) writeReadyFile(env.FAKE_READY_FILE, running.port);
  return running;
}

/** Written whole or not at all, so the waiting shell never reads half. */
function writeReadyFile(file: string, port: number) {
  const partial = `${file}.partial`;
  writeFileSync(partial, `${port}\n`);
  renameSync(partial, file);
}

/** Runs a fake's start-up; a failure ends the process with its reason. */
export function exitOnFailure(label: string, start: () => Promise<unknown>) {
  start().catch((error: unknown) => {
    const reason = error instanceof Error ? error.message : String(error);
    console.error(`[${label}] could not start: ${reason}`);
    process.exit(1);
  });
}
