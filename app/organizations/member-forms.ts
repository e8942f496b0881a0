/**
 * The Members page's forms: what each posts and what the action answers.
 * Plain module: the route's action parses with it, the forms read the answer.
 */
import { z } from "zod";
import { roles } from "~/auth/permissions";
import { emailField, type FieldErrors } from "~/lib/forms";
import { idField } from "~/lib/ids";

const roleField = z.enum(roles, { error: "Choose one of the four roles." });
const userIdField = z.string().min(1).max(64);

export const inviteSchema = z.strictObject({
  intent: z.literal("invite"),
  email: emailField,
  role: roleField,
});
export const changeRoleSchema = z.strictObject({
  intent: z.literal("change-role"),
  userId: userIdField,
  role: roleField,
});
export const removeSchema = z.strictObject({
  intent: z.literal("remove"),
  userId: userIdField,
});
export const revokeSchema = z.strictObject({
  intent: z.literal("revoke"),
  invitationId: idField("Unknown invitation."),
});

export type MembersActionResult = {
  intent: string;
  errors: FieldErrors;
  message?: string;
  /** The member a refused change was about. */
  subject?: string;
};
