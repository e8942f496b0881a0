import { Link } from "react-router";
import { roleLabels, type Role } from "~/auth/permissions";
import { ConfirmRevoke } from "~/components/confirm-revoke";
import { RelativeTime } from "~/components/relative-time";
import { Badge, buttonClass, EmptyState } from "~/components/ui";
import { dateTimeUtc, dayUtc } from "~/lib/format";

export interface TokenRow {
  id: string;
  name: string;
  role: Role;
  tokenPrefix: string;
  createdByName: string | null;
  createdAt: string;
  expiresAt: string | null;
  lastUsedAt: string | null;
  revokedAt: string | null;
}

type TokenState = "active" | "expired" | "revoked";

function stateOf(token: TokenRow, now: string): TokenState {
  if (token.revokedAt) return "revoked";
  if (token.expiresAt && token.expiresAt <= now) return "expired";
  return "active";
}

function StateBadge({ state }: { state: TokenState }) {
  if (state === "revoked") return <Badge tone="danger">Revoked</Badge>;
  if (state === "expired") return <Badge tone="copper">Expired</Badge>;
  return <Badge tone="spruce">Active</Badge>;
}

/** The second step of revoking: which tool is cut off, and when it last called. */
function ConfirmRevokeToken({ token, now }: { token: TokenRow; now: string }) {
  return (
    <ConfirmRevoke
      id={token.id}
      name={token.name}
      fields={{ tokenId: token.id }}
    >
      {token.lastUsedAt ? (
        <>
          It was last used <RelativeTime at={token.lastUsedAt} now={now} /> (
          {dateTimeUtc(token.lastUsedAt)}).
        </>
      ) : (
        "It has never been used."
      )}{" "}
      The token ({token.tokenPrefix}…) is refused from the moment you confirm;
      whatever uses it needs a new token. This cannot be undone.
    </ConfirmRevoke>
  );
}

function TokenFacts({ token, now }: { token: TokenRow; now: string }) {
  return (
    <dl className="mt-1 grid grid-cols-[auto_1fr] gap-x-3 text-sm text-ink-muted">
      <dt>Created</dt>
      <dd>
        {dayUtc(token.createdAt)} by {token.createdByName ?? "a former member"}
      </dd>
      <dt>Last used</dt>
      <dd>
        {token.lastUsedAt ? (
          <RelativeTime at={token.lastUsedAt} now={now} />
        ) : (
          "Never"
        )}
      </dd>
      <dt>Expires</dt>
      <dd>{token.expiresAt ? dayUtc(token.expiresAt) : "Never"}</dd>
    </dl>
  );
}

/** Every token of the organisation, newest first, with its state. */
export function TokenList({
  tokens,
  confirming,
  now,
}: {
  tokens: TokenRow[];
  confirming: string | null;
  now: string;
}) {
  if (tokens.length === 0)
    return (
      <div className="mt-3">
        <EmptyState title="No API tokens yet">
          Create one above for a script or a reporting tool.
        </EmptyState>
      </div>
    );
  return (
    <ul className="mt-2 divide-y divide-line">
      {tokens.map((token) => {
        const state = stateOf(token, now);
        return (
          <li key={token.id} className="py-3" data-testid="api-token-row">
            <div className="flex flex-wrap items-start justify-between gap-3">
              <div>
                <p className="font-semibold">
                  {token.name}{" "}
                  <span className="font-normal text-ink-muted">
                    · {roleLabels[token.role]}
                  </span>
                </p>
                <p className="font-mono text-sm text-ink-muted">
                  {token.tokenPrefix}…
                </p>
                <TokenFacts token={token} now={now} />
              </div>
              <div className="flex items-center gap-4">
                <StateBadge state={state} />
                {state !== "active" || confirming === token.id ? null : (
                  <Link
                    to={`?revoke=${token.id}`}
                    preventScrollReset
                    className={buttonClass("danger")}
                    aria-label={`Revoke ${token.name}…`}
                  >
                    Revoke…
                  </Link>
                )}
              </div>
            </div>
            {confirming === token.id ? (
              <ConfirmRevokeToken token={token} now={now} />
            ) : null}
          </li>
        );
      })}
    </ul>
  );
}
