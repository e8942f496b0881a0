/**
 * One Ledger page view resolves the request once: the session is validated
 * once and the membership read once per request, for the document, for a
 * client navigation's data request and for the grid's JSON call. The test
 * server counts both per request (JOULEBOOK_TEST_COUNTERS=1, see
 * app/auth/request-counters.server.ts).
 */
import { randomUUID } from "node:crypto";
import { eq } from "drizzle-orm";
import { afterAll, beforeAll, beforeEach, describe, expect, it } from "vitest";
import { Client, locationOf } from "../support/http";
import { createOrganization, db, pool, schema } from "../support/db";

afterAll(() => pool.end());
beforeEach(async () => {
  await db.delete(schema.signInAttempts);
});

let org: Awaited<ReturnType<typeof createOrganization>>;
beforeAll(async () => {
  org = await createOrganization(["auditor"]);
});

async function signedIn(): Promise<Client> {
  const client = new Client();
  const { email, password } = org.members[0];
  await client.signIn(email, password);
  return client;
}

/** Sends a GET counted under a fresh key and returns the answer and its tally. */
async function counted(client: Client, path: string) {
  const key = randomUUID();
  const response = await client.request(path, {
    headers: { "x-joulebook-count": key },
  });
  await response.arrayBuffer(); // the tally is complete once the body is
  const tally = await fetch(`${client.baseUrl}/__counters/${key}`);
  return { response, counts: await tally.json() };
}

const once = { sessionValidations: 1, membershipReads: 1 };

describe("one Ledger page view", () => {
  it("validates the session and reads the membership once for the page", async () => {
    const client = await signedIn();
    const { response, counts } = await counted(client, `/o/${org.id}/ledger`);
    expect(response.status).toBe(200);
    expect(counts).toEqual(once);
  });

  it("does the same for a client navigation's data request", async () => {
    const client = await signedIn();
    const { response, counts } = await counted(
      client,
      `/o/${org.id}/ledger.data`,
    );
    expect(response.status).toBe(200);
    expect(counts).toEqual(once);
  });

  it("does the same for the grid's JSON call", async () => {
    const client = await signedIn();
    const { response, counts } = await counted(
      client,
      `/api/v1/orgs/${org.id}/ledger?from=2026-01&to=2026-12`,
    );
    expect(response.status).toBe(200);
    expect(counts).toEqual(once);
  });
});

describe("the request's person, resolved once, behaves as before", () => {
  it("sends a signed-out visitor to sign in and back to the page asked for", async () => {
    const response = await new Client().get(
      `/o/${org.id}/ledger?from=2026-01&to=2026-03`,
    );
    expect(response.status).toBe(302);
    expect(locationOf(response)).toBe(
      `/sign-in?redirectTo=${encodeURIComponent(`/o/${org.id}/ledger?from=2026-01&to=2026-03`)}`,
    );
  });

  it("answers 404 for an organisation the person is not a member of", async () => {
    const client = await signedIn();
    const other = await createOrganization(["owner"]);
    expect((await client.get(`/o/${other.id}/ledger`)).status).toBe(404);
    expect((await client.get(`/o/not-a-uuid/ledger`)).status).toBe(404);
    expect(
      (
        await client.get(
          `/api/v1/orgs/${other.id}/ledger?from=2026-01&to=2026-02`,
        )
      ).status,
    ).toBe(404);
  });

  it("answers 403 with today's words for a page the role may not see", async () => {
    const client = await signedIn(); // an auditor may not see billing
    const response = await client.get(`/o/${org.id}/billing`);
    expect(response.status).toBe(403);
    expect(await response.text()).toContain("Your role does not allow this.");
  });

  it("re-sends the session cookie when the session was extended", async () => {
    const client = await signedIn();
    const sessionId = /jb_session=([^;]+)/.exec(client.cookieHeader())?.[1];
    expect(sessionId).toBeTruthy();
    // Within half of its 30 days of its end, lucia extends a session.
    await db
      .update(schema.sessions)
      .set({ expiresAt: new Date(Date.now() + 5 * 86_400_000) })
      .where(eq(schema.sessions.id, sessionId!));
    const response = await client.get(`/o/${org.id}/ledger`);
    expect(response.status).toBe(200);
    const cookie = response.headers
      .getSetCookie()
      .find((c) => c.startsWith("jb_session="));
    expect(cookie).toContain(`jb_session=${sessionId};`);
    expect(cookie).toMatch(/Max-Age=2592000/);
  });
});
