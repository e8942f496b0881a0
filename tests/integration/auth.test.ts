import { afterAll, beforeEach, describe, expect, it } from "vitest";
import { Client, DEMO_PASSWORD, locationOf } from "../support/http";
import { createOrganization, db, pool, schema } from "../support/db";

// Every test here signs in from 127.0.0.1; start each with a clean slate of
// recorded attempts so the per-client limit of one test does not leak.
beforeEach(async () => {
  await db.delete(schema.signInAttempts);
});
afterAll(() => pool.end());

describe("sign-in", () => {
  it("signs in with the right password and lands in the first organisation", async () => {
    const client = new Client();
    const response = await client.post("/sign-in", {
      email: "owner@larchmere.example",
      password: DEMO_PASSWORD,
    });
    expect(response.status).toBe(302);
    const cookie = response.headers.get("set-cookie") ?? "";
    expect(cookie).toMatch(/jb_session=/);
    expect(cookie).toMatch(/HttpOnly/i);
    expect(cookie).toMatch(/SameSite=Lax/i);
    expect(cookie).not.toMatch(/Secure/i); // plain HTTP on loopback
    const home = await client.get("/");
    expect(locationOf(home)).toMatch(/^\/o\/[0-9a-f-]{36}$/);
    const page = await client.get(locationOf(home));
    expect(page.status).toBe(200);
    expect(await page.text()).toContain("Larchmere Borough Estates");
  });

  it("accepts the e-mail address in any letter case", async () => {
    const response = await new Client().post("/sign-in", {
      email: "Owner@Larchmere.EXAMPLE",
      password: DEMO_PASSWORD,
    });
    expect(response.status).toBe(302);
  });

  it("refuses a wrong password and an unknown address with the same message", async () => {
    const wrong = await new Client().post("/sign-in", {
      email: "owner@larchmere.example",
      password: "not-the-password",
    });
    const unknown = await new Client().post("/sign-in", {
      email: "nobody@larchmere.example",
      password: "whatever-123",
    });
    expect(wrong.status).toBe(400);
    expect(unknown.status).toBe(400);
    const message = "That e-mail address and password do not match an account.";
    expect(await wrong.text()).toContain(message);
    expect(await unknown.text()).toContain(message);
    expect(wrong.headers.get("set-cookie")).toBeNull();
  });

  it("answers bad form input beside the field and signs nobody in", async () => {
    const empty = await new Client().post("/sign-in", {
      email: "",
      password: "",
    });
    expect(empty.status).toBe(400);
    const body = await empty.text();
    expect(body).toContain("Enter an e-mail address.");
    const tooLong = await new Client().post("/sign-in", {
      email: `${"a".repeat(250)}@x.example`,
      password: "x",
    });
    expect(await tooLong.text()).toContain("at most 254 characters");
    const extra = await new Client().post("/sign-in", {
      email: "owner@larchmere.example",
      password: DEMO_PASSWORD,
      role: "owner",
    });
    expect(extra.status).toBe(400);
  });

  it("throttles repeated failures for one address, even when the password is then right", async () => {
    const org = await createOrganization(["owner"]);
    const { email, password } = org.members[0];
    for (let i = 0; i < 5; i++) {
      const r = await new Client().post("/sign-in", {
        email,
        password: `wrong-${i}-password`,
      });
      expect(r.status).toBe(400);
    }
    const blocked = await new Client().post("/sign-in", { email, password });
    expect(blocked.status).toBe(429);
    expect(Number(blocked.headers.get("retry-after"))).toBeGreaterThan(0);
    expect(await blocked.text()).toContain("Too many failed attempts");
    // Another account from the same client is not affected.
    const other = await new Client().post("/sign-in", {
      email: "manager@larchmere.example",
      password: DEMO_PASSWORD,
    });
    expect(other.status).toBe(302);
  });

  it("signs out by POST only and the old cookie stops working", async () => {
    const client = new Client();
    await client.signIn("finance@larchmere.example");
    const stolenCookie = client.cookieHeader();
    const viaGet = await client.get("/sign-out");
    expect(viaGet.status).toBe(302);
    expect((await client.get("/account")).status).toBe(200);
    const out = await client.post("/sign-out", {});
    expect(locationOf(out)).toBe("/sign-in");
    const replay = await fetch(`${client.baseUrl}/account`, {
      headers: { cookie: stolenCookie },
      redirect: "manual",
    });
    expect(replay.status).toBe(302);
    expect(replay.headers.get("location")).toContain("/sign-in");
  });

  it("a password change ends the account's other sessions but keeps this one", async () => {
    const org = await createOrganization(["auditor"]);
    const { email, password } = org.members[0];
    const laptop = new Client();
    const phone = new Client();
    await laptop.signIn(email, password);
    await phone.signIn(email, password);
    const wrongCurrent = await laptop.post("/account", {
      current: "nope-nope-nope",
      password: "a-new-password-1",
      confirm: "a-new-password-1",
    });
    expect(wrongCurrent.status).toBe(400);
    const mismatch = await laptop.post("/account", {
      current: password,
      password: "a-new-password-1",
      confirm: "different-123",
    });
    expect(await mismatch.text()).toContain("The two passwords differ.");
    const changed = await laptop.post("/account", {
      current: password,
      password: "a-new-password-1",
      confirm: "a-new-password-1",
    });
    expect(changed.status).toBe(302);
    expect(locationOf(changed)).toBe("/account?changed=1");
    const after = await laptop.get("/account?changed=1");
    expect(after.status).toBe(200);
    expect(await after.text()).toContain("Other sessions have ended.");
    expect((await phone.get("/account")).status).toBe(302);
    await db.delete(schema.signInAttempts);
    expect(
      (await new Client().post("/sign-in", { email, password })).status,
    ).toBe(400);
    expect(
      (
        await new Client().post("/sign-in", {
          email,
          password: "a-new-password-1",
        })
      ).status,
    ).toBe(302);
  });

  it("never redirects to another host after sign-in", async () => {
    const response = await new Client().post("/sign-in", {
      email: "owner@larchmere.example",
      password: DEMO_PASSWORD,
      redirectTo: "//evil.example/phish",
    });
    expect(locationOf(response)).toBe("/");
  });

  it("refuses a cross-site form post", async () => {
    const response = await new Client().request("/sign-in", {
      method: "POST",
      headers: {
        "content-type": "application/x-www-form-urlencoded",
        origin: "http://evil.example",
      },
      body: new URLSearchParams({
        email: "owner@larchmere.example",
        password: DEMO_PASSWORD,
      }).toString(),
    });
    expect(response.status).toBe(403);
  });
});
