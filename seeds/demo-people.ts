/**
 * The invented demo scenario's people (see README). Development-only
 * credentials: the start command prints them; never use them in production.
 */
import type { Role } from "../app/auth/permissions";

export const DEMO_PASSWORD = "larchmere-demo-2026";
export const DEFAULT_DEMO_GATEWAY_KEY =
  "jbgw_demo_larchmere_development_only_key";

export const LARCHMERE = "Larchmere Borough Estates";
export const HOLLOWMEAD = "Hollowmead Housing Co-operative";

export interface DemoPerson {
  email: string;
  name: string;
  memberships: { organization: string; role: Role }[];
}

export const demoPeople: DemoPerson[] = [
  {
    email: "owner@larchmere.example",
    name: "Ruth Okafor",
    memberships: [{ organization: LARCHMERE, role: "owner" }],
  },
  {
    email: "manager@larchmere.example",
    name: "Tomasz Wren",
    memberships: [{ organization: LARCHMERE, role: "energy_manager" }],
  },
  {
    email: "finance@larchmere.example",
    name: "Priya Lindqvist",
    memberships: [{ organization: LARCHMERE, role: "finance" }],
  },
  {
    email: "auditor@larchmere.example",
    name: "Glen Abbott",
    memberships: [{ organization: LARCHMERE, role: "auditor" }],
  },
  {
    email: "owner@hollowmead.example",
    name: "Nadia Ferreira",
    memberships: [{ organization: HOLLOWMEAD, role: "owner" }],
  },
  {
    email: "consultant@fernbank.example",
    name: "Sam Ferrier",
    memberships: [
      { organization: LARCHMERE, role: "auditor" },
      { organization: HOLLOWMEAD, role: "energy_manager" },
    ],
  },
];
