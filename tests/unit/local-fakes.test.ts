/**
 * `start_local_fakes` (scripts/lib.sh), which npm start and npm run dev use:
 * every checkout (data folder) gets e-mail and Stripe fakes of its own on
 * ports recorded in that folder, never another checkout's fakes or some other
 * program that happens to listen on a port.
 */
import {
  existsSync,
  mkdirSync,
  mkdtempSync,
  readFileSync,
  rmSync,
  writeFileSync,
} from "node:fs";
import { createServer, type Server } from "node:net";
import type { AddressInfo } from "node:net";
import { tmpdir } from "node:os";
import { join } from "node:path";
import { afterAll, beforeAll, describe, expect, it } from "vitest";
import { runLibSh, startLibSh, type RunningShell } from "../support/lib-sh";

// Each start runs the fakes through tsx: seconds on a quiet machine, much
// longer on a busy one, hence the generous limits below.

// Starts the fakes, prints where they are, and keeps them until stdin closes.
const START_AND_HOLD = `start_local_fakes
echo "FAKES $RESEND_BASE_URL $STRIPE_API_BASE"
read -r _ || true`;

// Real keys would skip the fakes; none must leak in from the test's shell.
const NO_SERVICES = {
  RESEND_BASE_URL: undefined,
  RESEND_API_KEY: undefined,
  RESEND_FAKE_PORT: undefined,
  STRIPE_API_BASE: undefined,
  STRIPE_SECRET_KEY: undefined,
  STRIPE_FAKE_PORT: undefined,
};
// Only the e-mail fake, where billing is beside the point (it starts faster).
const MAIL_ONLY = {
  ...NO_SERVICES,
  STRIPE_API_BASE: "http://127.0.0.1:9",
  STRIPE_SECRET_KEY: "sk_test_unused",
};

let root: string;
let foreign: Server;
let foreignPort: number;
const shells: RunningShell[] = [];
const strayPids: number[] = [];

function dataDir(name: string) {
  const dir = join(root, name);
  mkdirSync(dir, { recursive: true });
  return dir;
}

function portOf(url: string) {
  return Number(new URL(url).port);
}

function recorded(dir: string, name: string) {
  return Number(readFileSync(join(dir, `${name}-port`), "utf8").trim());
}

async function startFakes(
  dir: string,
  env: Record<string, string | undefined>,
) {
  const shell = startLibSh(START_AND_HOLD, {
    ...env,
    JOULEBOOK_DATA_DIR: dir,
  });
  shells.push(shell);
  const [, resend, stripe] = await shell.line(/^FAKES (\S+) (\S+)$/m);
  const stop = async () => {
    shell.child.stdin?.end();
    await shell.exited;
  };
  return { resend, stripe, shell, stop };
}

async function outboxSubjects(resendUrl: string) {
  const response = await fetch(`${resendUrl}/emails`);
  const body = (await response.json()) as { data: { subject: string }[] };
  return body.data.map((m) => m.subject);
}

async function sendTestEmail(resendUrl: string, subject: string) {
  const response = await fetch(`${resendUrl}/emails`, {
    method: "POST",
    headers: {
      authorization: "Bearer re_test",
      "content-type": "application/json",
    },
    body: JSON.stringify({
      from: "a@example.org",
      to: "b@example.org",
      subject,
      text: "hello",
    }),
  });
  expect(response.status).toBe(200);
}

beforeAll(async () => {
  root = mkdtempSync(join(tmpdir(), "joulebook-fakes-"));
  // Some other program on a loopback port: not a fake of any checkout.
  foreign = createServer((socket) => socket.end("not a fake\n"));
  await new Promise<void>((resolve) => foreign.listen(0, "127.0.0.1", resolve));
  foreignPort = (foreign.address() as AddressInfo).port;
});

afterAll(async () => {
  // A fake orphaned on purpose, in case the test failed before it was
  // stopped; the check keeps a recycled pid from being killed.
  for (const pid of strayPids) {
    const environ = `/proc/${pid}/environ`;
    if (existsSync(environ) && readFileSync(environ, "utf8").includes(root))
      process.kill(pid);
  }
  for (const shell of shells) {
    shell.child.stdin?.end();
    await shell.exited;
  }
  await new Promise((resolve) => foreign.close(resolve));
  rmSync(root, { recursive: true, force: true });
});

describe("start_local_fakes", () => {
  it("gives each checkout its own fakes on recorded ports, moving off a port another program took", async () => {
    const first = dataDir("first");
    const second = dataDir("second");
    // The first checkout's recorded e-mail port is now someone else's.
    writeFileSync(join(first, "resend-fake-port"), `${foreignPort}\n`);

    const a = await startFakes(first, NO_SERVICES);
    expect(portOf(a.resend)).not.toBe(foreignPort);
    expect(recorded(first, "resend-fake")).toBe(portOf(a.resend));
    expect(recorded(first, "stripe-fake")).toBe(portOf(a.stripe));
    expect(a.shell.output().stdout).toContain(
      `port ${foreignPort} is taken by another program`,
    );

    // A second checkout beside the first gets fakes of its own.
    const b = await startFakes(second, NO_SERVICES);
    const ports = [a.resend, a.stripe, b.resend, b.stripe].map(portOf);
    expect(new Set([...ports, foreignPort]).size).toBe(5);
    expect(recorded(second, "resend-fake")).toBe(portOf(b.resend));
    expect(recorded(second, "stripe-fake")).toBe(portOf(b.stripe));

    // Mail sent to one checkout's fake is not in the other's outbox.
    await sendTestEmail(b.resend, "for the second checkout");
    expect(await outboxSubjects(b.resend)).toEqual(["for the second checkout"]);
    expect(await outboxSubjects(a.resend)).toEqual([]);
    const state = await fetch(`${a.stripe}/_fake/state`);
    expect(state.status).toBe(200);

    await a.stop();
    await b.stop();
    expect(existsSync(join(first, "resend-fake.pid"))).toBe(false);

    // The next start of the first checkout reuses its recorded ports.
    const again = await startFakes(first, NO_SERVICES);
    expect(again.resend).toBe(a.resend);
    expect(again.stripe).toBe(a.stripe);
    await again.stop();
  }, 120_000);

  it("fails loudly when an explicit RESEND_FAKE_PORT is taken", async () => {
    const result = await runLibSh(START_AND_HOLD, {
      ...MAIL_ONLY,
      JOULEBOOK_DATA_DIR: dataDir("explicit"),
      RESEND_FAKE_PORT: String(foreignPort),
    });
    expect(result.code).not.toBe(0);
    expect(result.stdout).not.toContain("FAKES");
    expect(result.stderr).toContain(
      `RESEND_FAKE_PORT=${foreignPort}: port ${foreignPort} on 127.0.0.1 is already in use`,
    );
    expect(result.stderr).toContain("the e-mail fake did not start");
  }, 60_000);

  it("stops a fake left behind by a killed start and takes its port back", async () => {
    const dir = dataDir("leftover");
    const killed = await startFakes(dir, MAIL_ONLY);
    const [leftoverPid] = readFileSync(join(dir, "resend-fake.pid"), "utf8")
      .trim()
      .split(" ")
      .map(Number);
    strayPids.push(leftoverPid);
    // Killed outright, the script cannot stop its fake on the way out.
    killed.shell.child.kill("SIGKILL");
    await killed.shell.died;
    expect(await outboxSubjects(killed.resend)).toEqual([]);

    const next = await startFakes(dir, MAIL_ONLY);
    expect(next.shell.output().stdout).toContain(
      `Stopping the resend-fake left running by an earlier start (pid ${leftoverPid})`,
    );
    expect(next.resend).toBe(killed.resend);
    expect(() => process.kill(leftoverPid, 0)).toThrow();
    await next.stop();
  }, 120_000);
});
