import { randomUUID } from "node:crypto";
import type { Executor } from "~/db/client.server";
import { users } from "~/db/schema";
import { hashPassword } from "./password.server";

export async function createUser(
  tx: Executor,
  args: { email: string; name: string; password: string },
): Promise<string> {
  const id = randomUUID();
  await tx.insert(users).values({
    id,
    email: args.email.toLowerCase(),
    name: args.name,
    passwordHash: await hashPassword(args.password),
  });
  return id;
}
