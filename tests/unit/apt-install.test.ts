/**
 * `apt_install` (scripts/lib.sh) with apt-get replaced by a stub that records
 * its arguments: it waits while another process holds the apt lock, and a
 * real failure ends at once with a pointer to the log. No apt-get is run.
 */
import {
  chmodSync,
  mkdirSync,
  mkdtempSync,
  readFileSync,
  rmSync,
  writeFileSync,
} from "node:fs";
import { tmpdir } from "node:os";
import { join } from "node:path";
import { afterAll, beforeAll, describe, expect, it } from "vitest";
import { runLibSh } from "../support/lib-sh";

// The stub: one line of arguments per call in $STUB_CALLS, then what
// STUB_UPDATE / STUB_INSTALL say (ok, lock-once, lock-always, wait, fail).
const APT_GET_STUB = `#!/usr/bin/env bash
echo "$*" >>"$STUB_CALLS"
case " $* " in *" update "*) mode="$STUB_UPDATE" ;; *) mode="$STUB_INSTALL" ;; esac
case "$mode" in
  lock-once)
    if [ ! -f "$STUB_CALLS.locked" ]; then
      touch "$STUB_CALLS.locked"
      echo "E: Could not get lock /var/lib/apt/lists/lock. It is held by process 4242 (apt-get)"
      echo "E: Unable to lock directory /var/lib/apt/lists/"
      exit 100
    fi ;;
  lock-always)
    echo "E: Could not get lock /var/lib/apt/lists/lock. It is held by process 4242 (apt-get)"
    exit 100 ;;
  wait)
    echo "Waiting for cache lock: Could not get lock /var/lib/dpkg/lock-frontend. It is held by process 4343 (unattended-upgr)..."
    sleep 1.5 ;;
  fail)
    echo "E: Unable to locate package no-such-package"
    exit 100 ;;
esac
echo "stub apt-get $*: done"
`;

let root: string;
let stubBin: string;
let run = 0;

beforeAll(() => {
  root = mkdtempSync(join(tmpdir(), "joulebook-apt-"));
  stubBin = join(root, "bin");
  mkdirSync(stubBin);
  writeFileSync(join(stubBin, "apt-get"), APT_GET_STUB);
  // apt_install needs root; the stub `id` says so whoever runs the tests.
  writeFileSync(join(stubBin, "id"), "#!/bin/sh\necho 0\n");
  chmodSync(join(stubBin, "apt-get"), 0o755);
  chmodSync(join(stubBin, "id"), 0o755);
});

afterAll(() => rmSync(root, { recursive: true, force: true }));

async function aptInstall(stub: {
  update: string;
  install: string;
  lockTimeout?: number;
}) {
  const dataDir = join(root, `data-${++run}`);
  mkdirSync(dataDir);
  const calls = join(dataDir, "calls");
  const started = Date.now();
  const result = await runLibSh("apt_install poppler-utils libnss3-tools", {
    PATH: `${stubBin}:${process.env.PATH}`,
    JOULEBOOK_DATA_DIR: dataDir,
    JOULEBOOK_APT_LOCK_TIMEOUT: String(stub.lockTimeout ?? 600),
    JOULEBOOK_APT_LOCK_POLL_SECONDS: "0.2",
    STUB_CALLS: calls,
    STUB_UPDATE: stub.update,
    STUB_INSTALL: stub.install,
  });
  const callLines = readFileSync(calls, "utf8").trim().split("\n");
  return {
    ...result,
    seconds: (Date.now() - started) / 1000,
    updates: callLines.filter((c) => / update$/.test(c)),
    installs: callLines.filter((c) => / install /.test(c)),
    log: readFileSync(join(dataDir, "apt.log"), "utf8"),
    dataDir,
  };
}

function lockTimeoutOf(call: string) {
  const match = call.match(/-o DPkg::Lock::Timeout=(\d+) /);
  return match ? Number(match[1]) : undefined;
}

describe("apt_install", () => {
  it("lets apt-get update and install wait for the apt lock", async () => {
    const result = await aptInstall({ update: "ok", install: "ok" });
    expect(result.code).toBe(0);
    expect(result.updates).toHaveLength(1);
    expect(result.installs).toHaveLength(1);
    for (const call of [...result.updates, ...result.installs]) {
      const timeout = lockTimeoutOf(call);
      expect(timeout).toBeGreaterThanOrEqual(595);
      expect(timeout).toBeLessThanOrEqual(600);
    }
    expect(result.installs[0]).toMatch(
      / install -y poppler-utils libnss3-tools$/,
    );
    expect(result.stdout).not.toContain("Waiting for the apt lock");
    expect(result.log).toContain("stub apt-get");
  });

  it("says it waits while another process holds the lock, then goes on", async () => {
    const result = await aptInstall({ update: "lock-once", install: "wait" });
    expect(result.code).toBe(0);
    // update is refused once for the lists lock and tried again; install
    // waits inside apt and is run once.
    expect(result.updates).toHaveLength(2);
    expect(result.installs).toHaveLength(1);
    expect(result.stdout).toContain(
      "Waiting for the apt lock (held by process 4242 (apt-get))",
    );
    expect(result.stdout).toContain(
      "Waiting for the apt lock (held by process 4343 (unattended-upgr))",
    );
    expect(result.log).toContain("It is held by process 4242");
  });

  it("stops at once on a failure that is not the lock, pointing at the log", async () => {
    const result = await aptInstall({ update: "ok", install: "fail" });
    expect(result.code).not.toBe(0);
    expect(result.installs).toHaveLength(1);
    expect(result.seconds).toBeLessThan(5);
    expect(result.stderr).toContain(
      `apt-get install poppler-utils libnss3-tools failed; see ${result.dataDir}/apt.log`,
    );
    expect(result.log).toContain("Unable to locate package no-such-package");
  });

  it("gives up when the lock is still held at the deadline", async () => {
    const result = await aptInstall({
      update: "lock-always",
      install: "ok",
      lockTimeout: 2,
    });
    expect(result.code).not.toBe(0);
    expect(result.installs).toHaveLength(0);
    expect(result.updates.length).toBeGreaterThan(1);
    expect(result.seconds).toBeLessThan(5);
    expect(result.stderr).toContain(
      `apt-get update failed; see ${result.dataDir}/apt.log`,
    );
  });
});
