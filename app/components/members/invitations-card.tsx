import { Form } from "react-router";
import { roleLabels, type Role } from "~/auth/permissions";
import { ListCard } from "~/components/list-card";
import { Button } from "~/components/ui";
import { dateTimeUtc } from "~/lib/format";

/** Invitations sent and not yet accepted, each with "Withdraw". */
export function InvitationsCard({
  invitations,
}: {
  invitations: { id: string; email: string; role: Role; expiresAt: Date }[];
}) {
  return (
    <ListCard
      headingId="invitations-heading"
      title="Pending invitations"
      empty={
        invitations.length === 0
          ? {
              title: "No pending invitations",
              text: "Invitations you send appear here until they are accepted.",
            }
          : null
      }
    >
      {invitations.map((inv) => (
        <li
          key={inv.id}
          className="flex flex-wrap items-center justify-between gap-3 py-3"
        >
          <div>
            <p className="font-semibold">{inv.email}</p>
            <p className="text-sm text-ink-muted">
              {roleLabels[inv.role]} · expires {dateTimeUtc(inv.expiresAt)}
            </p>
          </div>
          <Form method="post">
            <input type="hidden" name="intent" value="revoke" />
            <input type="hidden" name="invitationId" value={inv.id} />
            <Button type="submit" variant="secondary">
              Withdraw
            </Button>
          </Form>
        </li>
      ))}
    </ListCard>
  );
}
