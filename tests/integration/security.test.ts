/**
 * The attacks of issue "Security and reliability blockers", tried the way an
 * attacker would: reading someone else's reset link in the Outbox, an open
 * redirect after sign-in, old reset links, unthrottled reset e-mails and
 * racing the sign-in throttle.
 */
import { randomUUID } from "node:crypto";
import { and, eq } from "drizzle-orm";
import { afterAll, beforeEach, describe, expect, it } from "vitest";
import { inject } from "vitest";
import {
  Client,
  DEMO_PASSWORD,
  latestEmailTo,
  linkIn,
  locationOf,
  outbox,
} from "../support/http";
import { createOrganization, db, pool, schema } from "../support/db";

beforeEach(async () => {
  await db.delete(schema.signInAttempts);
});
afterAll(() => pool.end());

/** A documentation address (RFC 5737) of its own for each test client. */
let nextHost = 1;
const freshClientAddress = () => `203.0.113.${nextHost++}`;

describe("the Outbox", () => {
  it("a stranger who signs up cannot read the owner's reset link", async () => {
    const stranger = new Client(freshClientAddress());
    const tag = randomUUID().slice(0, 8);
    const signUp = await stranger.post("/sign-up", {
      name: "Sam Stranger",
      email: `stranger-${tag}@elsewhere.example`,
      password: "stranger-pass-123",
      confirm: "stranger-pass-123",
      organization: `Stranger Holdings ${tag}`,
    });
    expect(signUp.status).toBe(302);
    expect((await stranger.get("/outbox")).status).toBe(200);

    const asked = await stranger.post("/forgot-password", {
      email: "owner@larchmere.example",
    });
    expect(asked.status).toBe(200);
    const resetMail = await latestEmailTo("owner@larchmere.example");
    expect(resetMail?.subject).toBe("Reset your Joulebook password");
    const resetPath = linkIn(resetMail!.text);

    const page = await (await stranger.get("/outbox")).text();
    expect(page).not.toContain(resetPath);
    expect(page).not.toContain("owner@larchmere.example");
    // Naming the message does not open it either.
    const byId = await (
      await stranger.get(`/outbox?id=${resetMail!.id}`)
    ).text();
    expect(byId).not.toContain(resetPath);
    // Nor does the operator's page without the operator's key.
    expect((await stranger.get("/operator/outbox")).status).toBe(403);
    expect(
      (await stranger.get("/operator/outbox?key=guessed-key-0123456789abcdef"))
        .status,
    ).toBe(403);

    // The addressee, signed in, reads their own message.
    const owner = new Client(freshClientAddress());
    await owner.signIn("owner@larchmere.example");
    expect(await (await owner.get("/outbox")).text()).toContain(resetPath);
  });

  it("the operator's key opens every message, through a cookie for that page only", async () => {
    const operator = new Client();
    const key = inject("outboxOperatorKey");
    const opened = await operator.get(
      `/operator/outbox?key=${encodeURIComponent(key)}`,
    );
    expect(opened.status).toBe(302);
    expect(locationOf(opened)).toBe("/operator/outbox");
    const cookie = opened.headers.get("set-cookie") ?? "";
    expect(cookie).toMatch(/Path=\/operator\/outbox/);
    expect(cookie).toMatch(/HttpOnly/i);
    const newest = (await outbox())[0];
    const page = await operator.get(`/operator/outbox?id=${newest.id}`);
    expect(page.status).toBe(200);
    expect(await page.text()).toContain(newest.subject);
  });

  it("an owner sees the invitations their organisation sent; other members do not", async () => {
    const org = await createOrganization(["owner", "energy_manager"]);
    const [owner, manager] = org.members;
    const ownerClient = new Client(freshClientAddress());
    await ownerClient.signIn(owner.email, owner.password);
    const invitee = `new-${randomUUID().slice(0, 8)}@test.example`;
    const invited = await ownerClient.post(`/o/${org.id}/members`, {
      intent: "invite",
      email: invitee,
      role: "auditor",
    });
    expect(invited.status).toBeLessThan(400);
    const invitation = await latestEmailTo(invitee);
    const link = linkIn(invitation!.text);
    expect(await (await ownerClient.get("/outbox")).text()).toContain(link);
    const managerClient = new Client(freshClientAddress());
    await managerClient.signIn(manager.email, manager.password);
    expect(await (await managerClient.get("/outbox")).text()).not.toContain(
      link,
    );
  });
});

describe("the redirect after sign-in", () => {
  const hostile = [
    "/\t/evil.example/",
    "//evil.example/",
    "/\\evil.example/",
    "/\r\n/evil.example/",
    "/ok\r\nSet-Cookie: x=1",
    "https://evil.example/",
  ];

  it.each(hostile)("signing in with redirectTo %j lands on /", async (to) => {
    const response = await new Client(freshClientAddress()).post("/sign-in", {
      email: "auditor@larchmere.example",
      password: DEMO_PASSWORD,
      redirectTo: to,
    });
    expect(response.status).toBe(302);
    expect(locationOf(response)).toBe("/");
  });

  it("an encoded tab or CR/LF in the sign-in page's address gives the default page, not a 500", async () => {
    const client = new Client(freshClientAddress());
    await client.signIn("auditor@larchmere.example");
    for (const query of [
      "%2F%09%2Fevil.example%2F",
      "%2F%0D%0A%2Fevil.example",
      "%0D%0ASet-Cookie%3Ax%3D1",
      "%2F%00%2Fevil.example",
    ]) {
      const response = await client.get(`/sign-in?redirectTo=${query}`);
      expect(response.status, query).toBe(302);
      expect(locationOf(response), query).toBe("/");
    }
  });

  it("a hostile redirectTo never reaches the sign-in form's hidden field", async () => {
    const page = await new Client().get(
      "/sign-in?redirectTo=%2F%09%2Fevil.example%2F",
    );
    expect(page.status).toBe(200);
    expect(await page.text()).toMatch(/name="redirectTo" value=""/);
  });

  it("a same-site path is followed", async () => {
    const response = await new Client(freshClientAddress()).post("/sign-in", {
      email: "auditor@larchmere.example",
      password: DEMO_PASSWORD,
      redirectTo: "/account?tab=1",
    });
    expect(locationOf(response)).toBe("/account?tab=1");
  });
});

async function requestResetLink(email: string, client: Client) {
  const before = (await latestEmailTo(email))?.id;
  expect((await client.post("/forgot-password", { email })).status).toBe(200);
  const message = await latestEmailTo(email);
  expect(message?.id).not.toBe(before);
  return linkIn(message!.text);
}

describe("password-reset links", () => {
  it("a password change ends every outstanding link", async () => {
    const org = await createOrganization(["finance"]);
    const { email, password } = org.members[0];
    const first = await requestResetLink(
      email,
      new Client(freshClientAddress()),
    );
    const second = await requestResetLink(
      email,
      new Client(freshClientAddress()),
    );
    const client = new Client(freshClientAddress());
    await client.signIn(email, password);
    const changed = await client.post("/account", {
      current: password,
      password: "changed-pass-456",
      confirm: "changed-pass-456",
    });
    expect(changed.status).toBe(302);
    for (const link of [first, second]) {
      const page = await new Client().get(link);
      expect(await page.text()).toContain(
        "the password was changed after it was sent",
      );
      const used = await new Client().post(link, {
        password: "hijacked-pass-789",
        confirm: "hijacked-pass-789",
      });
      expect(used.status).toBe(410);
    }
    const stillChanged = await new Client(freshClientAddress()).post(
      "/sign-in",
      {
        email,
        password: "changed-pass-456",
      },
    );
    expect(stillChanged.status).toBe(302);
  });

  it("a used link ends the other outstanding links", async () => {
    const org = await createOrganization(["auditor"]);
    const { email } = org.members[0];
    const older = await requestResetLink(
      email,
      new Client(freshClientAddress()),
    );
    const newer = await requestResetLink(
      email,
      new Client(freshClientAddress()),
    );
    const done = await new Client().post(newer, {
      password: "from-newer-link-1",
      confirm: "from-newer-link-1",
    });
    expect(done.status).toBe(302);
    const replay = await new Client().post(older, {
      password: "from-older-link-2",
      confirm: "from-older-link-2",
    });
    expect(replay.status).toBe(410);
    expect(
      (
        await new Client(freshClientAddress()).post("/sign-in", {
          email,
          password: "from-newer-link-1",
        })
      ).status,
    ).toBe(302);
  });

  it("reset e-mails are throttled per address and per client, with the same answer", async () => {
    const org = await createOrganization(["finance", "auditor"]);
    const [victim, other] = org.members;
    const mailsTo = async (email: string) =>
      (await outbox()).filter((m) => m.to.includes(email)).length;
    const answers: string[] = [];
    // Three an hour for one address, whichever clients ask.
    for (let i = 0; i < 5; i++) {
      const response = await new Client(freshClientAddress()).post(
        "/forgot-password",
        { email: victim.email },
      );
      expect(response.status).toBe(200);
      answers.push(await response.text());
    }
    expect(await mailsTo(victim.email)).toBe(3);
    const sentWords =
      "If an account uses that address, a reset link is on its way.";
    expect(answers.every((html) => html.includes(sentWords))).toBe(true);

    // Ten an hour from one client, whichever addresses it asks for.
    const client = new Client(freshClientAddress());
    for (let i = 0; i < 10; i++)
      await client.post("/forgot-password", {
        email: `nobody-${i}-${randomUUID().slice(0, 6)}@test.example`,
      });
    const refused = await client.post("/forgot-password", {
      email: other.email,
    });
    expect(refused.status).toBe(200);
    expect(await refused.text()).toContain(sentWords);
    expect(await mailsTo(other.email)).toBe(0);
  });
});

describe("the sign-in throttle", () => {
  it("of 20 simultaneous wrong guesses, no more than the limit are judged", async () => {
    const org = await createOrganization(["owner"]);
    const { email, password } = org.members[0];
    const attacker = freshClientAddress();
    const answers = await Promise.all(
      Array.from({ length: 20 }, (_, i) =>
        new Client(attacker).post("/sign-in", {
          email,
          password: `wrong-guess-${i}`,
        }),
      ),
    );
    const statuses = answers.map((r) => r.status);
    const judged = statuses.filter((s) => s === 400).length;
    expect(judged).toBeLessThanOrEqual(5);
    expect(judged + statuses.filter((s) => s === 429).length).toBe(20);
    const failures = await db
      .select()
      .from(schema.signInAttempts)
      .where(
        and(
          eq(schema.signInAttempts.email, email),
          eq(schema.signInAttempts.succeeded, false),
        ),
      );
    expect(failures.length).toBe(judged);

    // Guessing on, one at a time, meets the same limit…
    for (let i = judged; i < 5; i++) {
      const guess = await new Client(attacker).post("/sign-in", {
        email,
        password: `late-guess-${i}`,
      });
      expect(guess.status).toBe(400);
    }
    const sixth = await new Client(attacker).post("/sign-in", {
      email,
      password: "one-guess-too-many",
    });
    expect(sixth.status).toBe(429);
    // …and then the attacker's client is refused even the right password…
    const fromAttacker = await new Client(attacker).post("/sign-in", {
      email,
      password,
    });
    expect(fromAttacker.status).toBe(429);
    // …while the owner, elsewhere, signs in.
    const fromOwner = await new Client(freshClientAddress()).post("/sign-in", {
      email,
      password,
    });
    expect(fromOwner.status).toBe(302);
  });

  it("slows down the guesses before refusing them", async () => {
    const org = await createOrganization(["auditor"]);
    const { email } = org.members[0];
    const client = new Client(freshClientAddress());
    const timeGuess = async () => {
      const started = performance.now();
      const response = await client.post("/sign-in", {
        email,
        password: "not-it-at-all",
      });
      return { status: response.status, ms: performance.now() - started };
    };
    const guesses = [];
    for (let i = 0; i < 6; i++) guesses.push(await timeGuess());
    expect(guesses.slice(0, 5).map((g) => g.status)).toEqual([
      400, 400, 400, 400, 400,
    ]);
    expect(guesses[5].status).toBe(429);
    // The third to fifth wait 0.25, 0.5 and 1 s before they are judged (lower
    // bounds only: a busy machine makes every answer slower, never faster).
    expect(guesses[2].ms).toBeGreaterThanOrEqual(250);
    expect(guesses[3].ms).toBeGreaterThanOrEqual(500);
    expect(guesses[4].ms).toBeGreaterThanOrEqual(1000);
  });

  it("a stranger trying many accounts from an office address does not lock out people who signed in there before", async () => {
    const org = await createOrganization(["energy_manager"]);
    const { email, password } = org.members[0];
    const office = freshClientAddress();
    const colleague = new Client(office);
    await colleague.signIn(email, password);
    await colleague.post("/sign-out", {});

    // A hundred failed attempts at other accounts from the same address.
    await db.insert(schema.signInAttempts).values(
      Array.from({ length: 100 }, (_, i) => ({
        email: `target-${i}@test.example`,
        clientAddress: office,
        succeeded: false,
      })),
    );
    const newcomer = await new Client(office).post("/sign-in", {
      email,
      password,
    });
    expect(newcomer.status).toBe(429);
    // The colleague's browser kept its device cookie: it is let in.
    const back = await colleague.post("/sign-in", { email, password });
    expect(back.status).toBe(302);
  });
});
