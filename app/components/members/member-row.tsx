import { useEffect, useRef } from "react";
import { Form } from "react-router";
import { roleDescriptions, roleLabels, type Role } from "~/auth/permissions";
import { Badge, Button, SelectField } from "~/components/ui";
import { dayUtc } from "~/lib/format";
import type { MembersActionResult } from "~/organizations/member-forms";
import { RoleOptions } from "./role-options";

/**
 * One member: name, address and joining day; for those who manage members,
 * the role menu and "Remove…", otherwise the role and what it may do.
 */
export function MemberRow({
  member,
  manage,
  isSelf,
  refusal,
}: {
  member: {
    userId: string;
    name: string;
    email: string;
    role: Role;
    joinedAt: Date;
  };
  manage: boolean;
  isSelf: boolean;
  /** The action's answer when it refused a change to this member. */
  refusal: MembersActionResult | undefined;
}) {
  const roleForm = useRef<HTMLFormElement>(null);
  // A refused change (the last owner's demotion) stored nothing, so the menu
  // goes back to the stored role instead of showing the refused one. Each
  // answer is a new object, so a second refusal resets the menu again.
  useEffect(() => {
    if (refusal) roleForm.current?.reset();
  }, [refusal]);
  return (
    <li className="grid gap-3 py-4 md:grid-cols-[minmax(0,2fr)_minmax(0,2fr)_auto] md:items-center">
      <div>
        <p className="font-semibold">
          {member.name}{" "}
          {isSelf ? (
            <span className="font-normal text-ink-muted">(you)</span>
          ) : null}
        </p>
        <p className="text-sm text-ink-muted">{member.email}</p>
        <p className="text-sm text-ink-faint">
          Joined {dayUtc(member.joinedAt)}
        </p>
      </div>
      {manage ? (
        <Form ref={roleForm} method="post" className="flex items-end gap-2">
          <input type="hidden" name="intent" value="change-role" />
          <input type="hidden" name="userId" value={member.userId} />
          <SelectField
            label={`Role of ${member.name}`}
            hideLabel
            name="role"
            defaultValue={member.role}
            className="grow"
          >
            <RoleOptions />
          </SelectField>
          <Button type="submit" variant="secondary">
            Save
          </Button>
        </Form>
      ) : (
        <div>
          <Badge tone={member.role === "owner" ? "copper" : "spruce"}>
            {roleLabels[member.role]}
          </Badge>
          <p className="mt-1 text-sm text-ink-muted">
            {roleDescriptions[member.role]}
          </p>
        </div>
      )}
      {manage ? (
        <details className="md:justify-self-end">
          <summary className="cursor-pointer rounded-lg px-3 py-2 font-semibold text-danger-700 hover:bg-danger-50">
            {isSelf ? "Leave…" : "Remove…"}
          </summary>
          <Form
            method="post"
            className="mt-2 flex flex-col gap-2 rounded-lg border border-danger-600/30 bg-danger-50 p-3"
          >
            <input type="hidden" name="intent" value="remove" />
            <input type="hidden" name="userId" value={member.userId} />
            <p className="text-sm">
              {member.name} loses access to this organisation at once.
            </p>
            <Button type="submit" variant="danger">
              Remove {member.name}
            </Button>
          </Form>
        </details>
      ) : null}
    </li>
  );
}
