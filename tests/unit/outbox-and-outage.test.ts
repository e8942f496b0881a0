import { describe, expect, it } from "vitest";
import { isDatabaseUnavailable } from "../../app/db/availability.server";
import { visibleTo } from "../../app/email/outbox-visibility";
import { slowDownMs } from "../../app/auth/policy";

const message = (to: string, tags: [string, string][] = []) => ({
  to: [to],
  tags: tags.map(([name, value]) => ({ name, value })),
});

describe("who reads which message in the Outbox", () => {
  const reset = message("owner@larchmere.example", [
    ["kind", "password_reset"],
  ]);
  const invitation = message("new@elsewhere.example", [
    ["kind", "invitation"],
    ["organization", "org-a"],
  ]);
  const mine = message("Sam@Stranger.example");
  const all = [reset, invitation, mine];

  it("a person sees only the messages addressed to them, in any letter case", () => {
    expect(
      visibleTo(all, { email: "sam@stranger.example", ownerOf: new Set() }),
    ).toEqual([mine]);
  });

  it("an owner also sees the invitations their organisation sent, not others'", () => {
    expect(
      visibleTo(all, { email: "x@y.example", ownerOf: new Set(["org-a"]) }),
    ).toEqual([invitation]);
    expect(
      visibleTo(all, { email: "x@y.example", ownerOf: new Set(["org-b"]) }),
    ).toEqual([]);
  });

  it("the operator sees everything", () => {
    expect(visibleTo(all, "operator")).toEqual(all);
  });
});

describe("telling a database outage from a bad query", () => {
  it("knows refused connections, shutdowns and lost connections, also wrapped", () => {
    const refused = Object.assign(new Error("connect ECONNREFUSED"), {
      code: "ECONNREFUSED",
    });
    expect(isDatabaseUnavailable(refused)).toBe(true);
    expect(
      isDatabaseUnavailable({ code: "57P01", message: "terminating" }),
    ).toBe(true);
    expect(
      isDatabaseUnavailable(new Error("Connection terminated unexpectedly")),
    ).toBe(true);
    // drizzle wraps the driver's error; Node wraps dual-stack refusals.
    expect(
      isDatabaseUnavailable(new Error("Failed query", { cause: refused })),
    ).toBe(true);
    expect(isDatabaseUnavailable(new AggregateError([refused]))).toBe(true);
  });

  it("does not take a query's own error for an outage", () => {
    expect(
      isDatabaseUnavailable({ code: "23505", message: "duplicate key" }),
    ).toBe(false);
    expect(isDatabaseUnavailable({ code: "22P05", message: "NUL" })).toBe(
      false,
    );
    expect(isDatabaseUnavailable(new Error("boom"))).toBe(false);
    expect(isDatabaseUnavailable(null)).toBe(false);
  });
});

describe("slowing down password guesses", () => {
  it("answers the first two at once, then doubles the pause", () => {
    expect([1, 2, 3, 4, 5].map(slowDownMs)).toEqual([0, 0, 250, 500, 1000]);
  });
});
