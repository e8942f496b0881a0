/**
 * A server with DATABASE_READ_URL pointed at a streaming standby of the test
 * cluster: the Ledger and the readings views read from the standby, exactly
 * what the primary holds once it has replayed; a person who has just written
 * reads their write at once (from the primary while the standby is behind);
 * health reports the standby's lag. The suite's own server, which has no
 * standby, is the primary's word to compare with.
 *
 * Replay is paused on the standby to hold it behind, so what each read
 * returns shows where it was served from.
 */
import { afterAll, beforeAll, describe, expect, it } from "vitest";
import { Client } from "../support/http";
import { createMeteredOrg, type MeteredOrg } from "../support/metered-org";
import { freePort, ServerProcess } from "../support/server-process";
import { startStandby, standbyUrl, type Standby } from "../support/standby";

const PG_DIR = process.env.JOULEBOOK_PG_DIR;

/** The hourly register readings of one day of January 2025. */
function registerDay(meterCode: string, day: number, startKwh: number) {
  return Array.from({ length: 24 }, (_, hour) => ({
    meter: meterCode,
    quantity: "electric_register",
    time: new Date(Date.UTC(2025, 0, day, hour)).toISOString(),
    register_kwh: startKwh + (24 * (day - 1) + hour) * 12.5,
  }));
}

describe.skipIf(!PG_DIR)("a streaming read replica", () => {
  let standby: Standby;
  let standbyStarting: Promise<Standby> | undefined;
  let server: ServerProcess;
  let org: MeteredOrg;
  /** The suite's server: reads the primary only. */
  let onPrimary: Client;
  /** Signed in on the replica server; writes readings. */
  let writer: Client;
  /** Signed in on the replica server too; never writes. */
  let reader: Client;

  const clientOf = (baseUrl: string) =>
    new (class extends Client {
      override readonly baseUrl = baseUrl;
    })();

  beforeAll(async () => {
    // The server may start before its standby answers (its pool connects
    // on the first read), so both start at once.
    const standbyPort = await freePort();
    server = new ServerProcess(await freePort(), {
      DATABASE_READ_URL: standbyUrl(standbyPort),
    });
    standbyStarting = startStandby(PG_DIR!, standbyPort);
    const [started, made] = await Promise.all([
      standbyStarting,
      createMeteredOrg(),
      server.start(),
    ]);
    standby = started;
    org = made;
    const { email, password } = org.org.members[0];
    onPrimary = new Client();
    writer = clientOf(server.baseUrl);
    reader = clientOf(server.baseUrl);
    await Promise.all(
      [onPrimary, writer, reader].map((c) => c.signIn(email, password)),
    );
  });

  afterAll(async () => {
    await server?.stop("SIGTERM");
    // Stopped even when the set-up failed after it started.
    await (await standbyStarting?.catch(() => null))?.stop();
  });

  const ledgerPath = () =>
    `/api/v1/orgs/${org.org.id}/ledger?from=2025-01&to=2025-01`;
  const intervalsPath = () =>
    `/api/v1/orgs/${org.org.id}/meters/${org.meters.register.id}/intervals` +
    `?from=2025-01-01T00:00:00Z&to=2025-01-04T00:00:00Z`;
  const json = async (response: Promise<Response>) => {
    const answer = await response;
    expect(answer.status).toBe(200);
    return answer.json();
  };
  const health = () =>
    json(fetch(`${server.baseUrl}/api/v1/health`)) as Promise<{
      status: string;
      standby?: { status: string; lag_bytes: number; lag_seconds: number };
    }>;
  const netOf = (ledger: { rows: { net_kwh: string }[] }) =>
    ledger.rows.map((row) => Number(row.net_kwh));

  it("reads the ledger and intervals from the standby exactly, and a writer reads their own write at once", async () => {
    const gateway = await json(
      clientOf(server.baseUrl).postJson(
        "/api/v1/readings",
        { readings: registerDay(org.meters.register.code, 1, 1000) },
        { authorization: `Bearer ${org.gatewayKey}` },
      ),
    );
    expect(gateway.accepted).toBe(24);

    // Caught up, then held there: from now on the standby answers with
    // exactly what the primary had.
    await standby.caughtUp();
    await standby.pauseReplay();
    const primaryBefore = await json(onPrimary.get(ledgerPath()));
    expect(netOf(primaryBefore)).toEqual([287.5]);
    expect(await json(reader.get(ledgerPath()))).toEqual(primaryBefore);
    expect(await json(reader.get(intervalsPath()))).toEqual(
      await json(onPrimary.get(intervalsPath())),
    );

    // A person's upload, while the standby is held behind.
    const upload = await json(
      writer.postJson(`/api/v1/orgs/${org.org.id}/readings`, {
        readings: registerDay(org.meters.register.code, 2, 1000),
      }),
    );
    expect(upload.accepted).toBe(24);
    expect(writer.cookieHeader()).toMatch(/jb_wrote=\d+/);
    expect(reader.cookieHeader()).not.toMatch(/jb_wrote/);

    const primaryAfter = await json(onPrimary.get(ledgerPath()));
    expect(netOf(primaryAfter)).toEqual([587.5]);
    // The writer sees the write (the primary serves, the standby being
    // behind); someone who did not write still reads the standby's state.
    expect(await json(writer.get(ledgerPath()))).toEqual(primaryAfter);
    expect(await json(writer.get(intervalsPath()))).toEqual(
      await json(onPrimary.get(intervalsPath())),
    );
    expect(await json(reader.get(ledgerPath()))).toEqual(primaryBefore);

    const held = await health();
    expect(held.status).toBe("ok");
    expect(held.standby?.status).toBe("replaying");
    expect(held.standby?.lag_bytes).toBeGreaterThan(0);

    // Replay resumed: everyone reads the write from the standby.
    await standby.resumeReplay();
    await standby.caughtUp();
    expect(await json(reader.get(ledgerPath()))).toEqual(primaryAfter);
    expect(await json(writer.get(ledgerPath()))).toEqual(primaryAfter);
    // Polled: the primary may write a little WAL of its own (autovacuum)
    // between two looks.
    await expect
      .poll(async () => (await health()).standby, { timeout: 10_000 })
      .toMatchObject({ status: "replaying", lag_bytes: 0, lag_seconds: 0 });
  });

  it("reads from the primary while the standby is away, and says so in health", async () => {
    await standby.stop();
    expect(await json(reader.get(ledgerPath()))).toEqual(
      await json(onPrimary.get(ledgerPath())),
    );
    const away = await health();
    expect(away.status).toBe("ok");
    expect(away.standby).toEqual({
      status: "unreachable",
      lag_bytes: null,
      lag_seconds: null,
    });
  });
});
