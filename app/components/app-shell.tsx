import type { ReactNode } from "react";
import { Form, NavLink, useLocation } from "react-router";
import {
  can,
  roleLabels,
  type Permission,
  type Role,
} from "~/auth/permissions";
import { cx, Wordmark } from "./ui";

export interface ShellOrganization {
  id: string;
  name: string;
  role: Role;
}

interface Area {
  label: string;
  path: string;
  permission: Permission;
  end?: boolean;
}

/** The organisation's areas, in the order people work through them. */
const areas: Area[] = [
  { label: "Overview", path: "/overview", permission: "ledger.view" },
  {
    label: "Organisation",
    path: "",
    permission: "organization.view",
    end: true,
  },
  { label: "Sites", path: "/sites", permission: "organization.view" },
  { label: "Ledger", path: "/ledger", permission: "ledger.view" },
  { label: "Carbon", path: "/carbon", permission: "ledger.view" },
  { label: "Tariffs", path: "/tariffs", permission: "tariffs.view" },
  { label: "Budgets", path: "/budgets", permission: "ledger.view" },
  {
    label: "Supplier bills",
    path: "/supplier-bills",
    permission: "bills.view",
  },
  {
    label: "Weather & baselines",
    path: "/weather",
    permission: "ledger.view",
  },
  { label: "Readings", path: "/readings", permission: "readings.view" },
  { label: "Gateways", path: "/gateways", permission: "gateways.manage" },
  { label: "Reports", path: "/reports", permission: "reports.download" },
  { label: "Billing", path: "/billing", permission: "billing.view" },
  { label: "Members", path: "/members", permission: "members.view" },
  { label: "Audit trail", path: "/audit", permission: "audit.view" },
  { label: "API tokens", path: "/api-tokens", permission: "tokens.manage" },
];

function navClass({ isActive }: { isActive: boolean }) {
  return cx(
    "flex min-h-10 items-center rounded-lg px-3 font-semibold",
    isActive
      ? "bg-spruce-700 text-white"
      : "text-spruce-50 hover:bg-spruce-800 hover:text-white",
  );
}

function OrganizationSwitcher({
  current,
  organizations,
}: {
  current: ShellOrganization | null;
  organizations: ShellOrganization[];
}) {
  if (!current) return null;
  return (
    <details className="group relative">
      <summary className="flex cursor-pointer list-none flex-col rounded-lg bg-spruce-800 px-3 py-2 text-left hover:bg-spruce-700">
        <span className="text-xs uppercase tracking-wider text-spruce-100">
          Organisation · switch
        </span>
        <span className="font-semibold text-white">{current.name}</span>
        <span className="text-sm text-spruce-100">
          {roleLabels[current.role]}
        </span>
      </summary>
      <ul className="absolute inset-x-0 z-20 mt-1 rounded-lg border border-line bg-surface p-1 text-ink shadow-lg">
        {organizations.map((org) => (
          <li key={org.id}>
            <a
              href={`/o/${org.id}`}
              aria-current={org.id === current.id ? "true" : undefined}
              className="flex flex-col rounded-md px-3 py-2 hover:bg-sunken aria-[current]:bg-spruce-50"
            >
              <span className="font-semibold">{org.name}</span>
              <span className="text-sm text-ink-muted">
                {roleLabels[org.role]}
              </span>
            </a>
          </li>
        ))}
      </ul>
    </details>
  );
}

function Navigation({
  current,
  outbox,
}: {
  current: ShellOrganization | null;
  outbox: boolean;
}) {
  return (
    <nav aria-label="Main" className="flex flex-col gap-1">
      {current
        ? areas
            .filter((area) => can(current.role, area.permission))
            .map((area) => (
              <NavLink
                key={area.label}
                to={`/o/${current.id}${area.path}`}
                end={area.end}
                className={navClass}
              >
                {area.label}
              </NavLink>
            ))
        : null}
      {outbox ? (
        <NavLink to="/outbox" className={navClass}>
          Outbox{" "}
          <span className="ml-2 rounded bg-copper-600 px-1.5 text-xs text-white">
            dev
          </span>
        </NavLink>
      ) : null}
    </nav>
  );
}

function UserPanel({ name, email }: { name: string; email: string }) {
  return (
    <div className="border-t border-spruce-800 pt-4">
      <p className="font-semibold text-white">{name}</p>
      <p className="truncate text-sm text-spruce-100">{email}</p>
      <div className="mt-3 flex gap-2">
        <NavLink
          to="/account"
          className="rounded-lg px-3 py-1.5 font-semibold text-spruce-50 ring-1 ring-spruce-600 hover:bg-spruce-800"
        >
          Account
        </NavLink>
        <Form method="post" action="/sign-out">
          <button
            type="submit"
            className="rounded-lg px-3 py-1.5 font-semibold text-spruce-50 ring-1 ring-spruce-600 hover:bg-spruce-800"
          >
            Sign out
          </button>
        </Form>
      </div>
    </div>
  );
}

export function AppShell(props: {
  user: { name: string; email: string };
  current: ShellOrganization | null;
  organizations: ShellOrganization[];
  outbox: boolean;
  children: ReactNode;
}) {
  const { pathname } = useLocation();
  const sidebar = (
    <div className="flex h-full flex-col gap-6 p-4">
      <OrganizationSwitcher
        current={props.current}
        organizations={props.organizations}
      />
      <Navigation current={props.current} outbox={props.outbox} />
      <div className="mt-auto">
        <UserPanel {...props.user} />
      </div>
    </div>
  );
  return (
    <div className="min-h-screen lg:grid lg:grid-cols-[17rem_minmax(0,1fr)]">
      <a
        href="#content"
        className="sr-only focus:not-sr-only focus:absolute focus:z-50 focus:m-2 focus:rounded focus:bg-surface focus:p-2"
      >
        Skip to content
      </a>
      <aside className="hidden bg-spruce-900 lg:block">
        <div className="sticky top-0 flex h-screen flex-col">
          <div className="px-5 pt-5">
            <Wordmark inverted />
          </div>
          {sidebar}
        </div>
      </aside>
      {/* Keyed by path so the phone menu closes after each navigation. */}
      <details key={pathname} className="bg-spruce-900 lg:hidden">
        <summary className="flex cursor-pointer list-none items-center justify-between px-4 py-3">
          <Wordmark inverted />
          <span className="rounded-lg px-3 py-1.5 font-semibold text-white ring-1 ring-spruce-600">
            Menu
          </span>
        </summary>
        {sidebar}
      </details>
      <main
        id="content"
        className="mx-auto w-full max-w-6xl px-4 py-6 sm:px-8 sm:py-10"
      >
        {props.children}
      </main>
    </div>
  );
}
