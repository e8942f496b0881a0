/**
 * A production server of a test's own, on a port of its own, for tests that
 * kill it or take its database away without disturbing the suite's server.
 */
import { spawn, type ChildProcess } from "node:child_process";
import type { AddressInfo } from "node:net";
import { createServer } from "node:net";
import { appTestEnv } from "./app-env";

const sleep = (ms: number) => new Promise((r) => setTimeout(r, ms));

export async function freePort(): Promise<number> {
  return new Promise((resolve, reject) => {
    const probe = createServer().listen(0, "127.0.0.1", () => {
      const { port } = probe.address() as AddressInfo;
      probe.close(() => resolve(port));
    });
    probe.on("error", reject);
  });
}

export class ServerProcess {
  child: ChildProcess | null = null;
  readonly baseUrl: string;

  constructor(
    readonly port: number,
    private readonly extraEnv: NodeJS.ProcessEnv = {},
  ) {
    this.baseUrl = `http://127.0.0.1:${port}`;
  }

  /** `withinMs`: how long it may take to answer its health check. */
  async start(withinMs = 60_000): Promise<void> {
    const env: NodeJS.ProcessEnv = {
      ...process.env,
      NODE_ENV: "production",
      PORT: String(this.port),
      HOST: "127.0.0.1",
      ...appTestEnv(),
      ...this.extraEnv,
    };
    // A server spawned from vitest must not think it runs under vitest.
    delete env.VITEST;
    const child = spawn(process.execPath, ["--import", "tsx", "server.ts"], {
      env,
      stdio: ["ignore", "inherit", "inherit"],
    });
    this.child = child;
    const deadline = Date.now() + withinMs;
    while (Date.now() < deadline) {
      if (child.exitCode !== null || child.signalCode !== null)
        throw new Error(
          `server exited (${child.exitCode ?? child.signalCode}) while starting`,
        );
      try {
        const response = await fetch(`${this.baseUrl}/api/v1/health`);
        if (response.ok) return;
      } catch {
        // not listening yet
      }
      await sleep(100);
    }
    throw new Error(
      `server did not become healthy within ${withinMs / 1000} s`,
    );
  }

  /** Sends the signal and waits (bounded) until the process is gone. */
  async stop(signal: NodeJS.Signals): Promise<void> {
    const child = this.child;
    if (!child || child.exitCode !== null || child.signalCode !== null) return;
    const exited = new Promise((r) => child.once("exit", r));
    child.kill(signal);
    const inTime = await Promise.race([
      exited.then(() => true),
      sleep(10_000).then(() => false),
    ]);
    if (!inTime) {
      child.kill("SIGKILL");
      await Promise.race([exited, sleep(5_000)]);
    }
  }
}
