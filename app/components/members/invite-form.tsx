import { Form, useNavigation } from "react-router";
import { INVITATION_DAYS } from "~/auth/policy";
import { SectionCard } from "~/components/section-card";
import { Button, Field, Notice, SelectField } from "~/components/ui";
import type { MembersActionResult } from "~/organizations/member-forms";
import { RoleOptions } from "./role-options";

/** An e-mail address and a role: the invitation goes out by e-mail. */
export function InviteForm({ result }: { result?: MembersActionResult }) {
  const navigation = useNavigation();
  const busy =
    navigation.state === "submitting" &&
    navigation.formData?.get("intent") === "invite";
  const errors = result?.intent === "invite" ? result.errors : {};
  return (
    <SectionCard headingId="invite-heading" title="Invite someone">
      <p className="mt-1 text-ink-muted">
        They get an e-mail with a link that works for {INVITATION_DAYS} days.
      </p>
      <Form
        method="post"
        className="mt-4 grid gap-4 sm:grid-cols-[minmax(0,2fr)_minmax(0,1fr)_auto] sm:items-end"
        noValidate
      >
        <input type="hidden" name="intent" value="invite" />
        <Field
          label="E-mail address"
          name="email"
          type="email"
          required
          error={errors.email}
        />
        <SelectField
          label="Role"
          name="role"
          defaultValue="energy_manager"
          error={errors.role}
        >
          <RoleOptions />
        </SelectField>
        <Button type="submit" disabled={busy}>
          {busy ? "Sending…" : "Send invitation"}
        </Button>
      </Form>
      {errors.form ? (
        <div className="mt-3">
          <Notice tone="error">{errors.form}</Notice>
        </div>
      ) : null}
    </SectionCard>
  );
}
