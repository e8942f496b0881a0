import { eq } from "drizzle-orm";
import { afterAll, beforeEach, describe, expect, it } from "vitest";
import { Client, latestEmailTo, linkIn, outbox } from "../support/http";
import { createOrganization, db, pool, schema } from "../support/db";

beforeEach(async () => {
  await db.delete(schema.signInAttempts);
});
afterAll(() => pool.end());

async function requestLink(email: string): Promise<string> {
  const response = await new Client().post("/forgot-password", { email });
  expect(response.status).toBe(200);
  const message = await latestEmailTo(email);
  expect(message?.subject).toBe("Reset your Joulebook password");
  return linkIn(message!.text);
}

describe("password reset by e-mailed link", () => {
  it("sets a new password once, ends old sessions, and the link cannot be reused", async () => {
    const org = await createOrganization(["finance"]);
    const { email, password } = org.members[0];
    const oldSession = new Client();
    await oldSession.signIn(email, password);

    const link = await requestLink(email);
    expect(link).toMatch(/^\/reset-password\/[\w-]{40,}$/);
    expect((await new Client().get(link)).status).toBe(200);

    const done = await new Client().post(link, {
      password: "brand-new-pass-1",
      confirm: "brand-new-pass-1",
    });
    expect(done.status).toBe(302);
    expect(done.headers.get("location")).toContain("/sign-in?reset=1");
    expect((await oldSession.get("/account")).status).toBe(302);
    expect(
      (
        await new Client().post("/sign-in", {
          email,
          password: "brand-new-pass-1",
        })
      ).status,
    ).toBe(302);

    const reused = await new Client().post(link, {
      password: "another-pass-22",
      confirm: "another-pass-22",
    });
    expect(reused.status).toBe(410);
    expect(await reused.text()).toContain("already been used");
    expect(
      (
        await new Client().post("/sign-in", {
          email,
          password: "another-pass-22",
        })
      ).status,
    ).toBe(400);
  });

  it("refuses an expired link and changes nothing", async () => {
    const org = await createOrganization(["auditor"]);
    const { email, password } = org.members[0];
    const link = await requestLink(email);
    await db
      .update(schema.passwordResetTokens)
      .set({ expiresAt: new Date(Date.now() - 1000) });
    const page = await new Client().get(link);
    expect(await page.text()).toContain("This link has expired.");
    const attempt = await new Client().post(link, {
      password: "expired-pass-123",
      confirm: "expired-pass-123",
    });
    expect(attempt.status).toBe(410);
    expect(
      (await new Client().post("/sign-in", { email, password })).status,
    ).toBe(302);
  });

  it("answers the same for an unknown address and sends nothing", async () => {
    const before = (await outbox()).length;
    const response = await new Client().post("/forgot-password", {
      email: "nobody-here@larchmere.example",
    });
    expect(response.status).toBe(200);
    expect(await response.text()).toContain("If an account uses that address");
    expect((await outbox()).length).toBe(before);
  });

  it("rejects a made-up token and a too-short new password", async () => {
    const bogus = await new Client().get("/reset-password/not-a-real-token");
    expect(await bogus.text()).toContain("This link is not valid.");
    const org = await createOrganization(["auditor"]);
    const link = await requestLink(org.members[0].email);
    const short = await new Client().post(link, {
      password: "short",
      confirm: "short",
    });
    expect(short.status).toBe(400);
    expect(await short.text()).toContain("Use at least 10 characters.");
    const [token] = await db
      .select({ usedAt: schema.passwordResetTokens.usedAt })
      .from(schema.passwordResetTokens)
      .innerJoin(
        schema.users,
        eq(schema.users.id, schema.passwordResetTokens.userId),
      )
      .where(eq(schema.users.email, org.members[0].email));
    expect(token.usedAt).toBeNull();
  });
});
