import type { Request, Response } from "express";
import { databaseReachable } from "~/db/client.server";
import { standbyState } from "~/db/read-source.server";
import { servingProcesses } from "~/processes/serving-processes.server";
import type { z } from "zod";
import type { healthSchema } from "./schemas";

/**
 * Liveness plus database reachability and the number of server processes
 * serving on this port, for load balancers and people.
 */
export async function health(_req: Request, res: Response): Promise<void> {
  const database = (await databaseReachable()) ? "reachable" : "unreachable";
  const standby = database === "reachable" ? await standbyState() : null;
  const body: z.output<typeof healthSchema> = {
    status: database === "reachable" ? "ok" : "degraded",
    database,
    processes: servingProcesses(),
    time: new Date().toISOString(),
    ...(standby && { standby }),
  };
  res.status(database === "reachable" ? 200 : 503).json(body);
}
