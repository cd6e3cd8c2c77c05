// One answer to "may this role do that?", asked by loaders/actions on the server and
// by the screens (to hide what a role cannot use). Hiding is a courtesy; the server's
// check is the permission.
import type { Role } from "../../../db/schema/core";

export type { Role };
export const ROLES: readonly Role[] = ["owner", "builder", "service_writer", "apprentice"];

export const ROLE_LABELS: Record<Role, string> = {
  owner: "Owner",
  builder: "Builder",
  service_writer: "Service writer",
  apprentice: "Apprentice",
};

const ALL = ["owner", "builder", "service_writer", "apprentice"] as const satisfies readonly Role[];
const STAFF_WITH_CUSTOMERS = [
  "owner",
  "builder",
  "service_writer",
] as const satisfies readonly Role[];

// The role table of the design, permission by permission.
export const PERMISSIONS = {
  "home:read": ALL,
  "library:read": ALL,
  "parts:read": ALL,
  "rules:read": ALL,
  "parts:edit": ["owner"],
  "rules:edit": ["owner"],
  "rates:edit": ["owner"],
  "limits:edit": ["owner"],
  "staff:manage": ["owner"],
  "outbox:read": ["owner"],
  "packages:read": STAFF_WITH_CUSTOMERS,
  "packages:create": STAFF_WITH_CUSTOMERS,
  "packages:edit": ["owner", "builder"],
  "packages:publish": ["owner", "builder"],
  "dyno:log": ["owner", "builder"],
  "keepcheck:edit": ["owner", "service_writer"],
  "requests:read": ["owner", "service_writer"],
  "requests:edit": ["owner", "service_writer"],
  "customers:read": STAFF_WITH_CUSTOMERS,
  "customers:edit": ["owner", "service_writer"],
  "customers:contact": STAFF_WITH_CUSTOMERS,
  "customers:export": ["owner"],
  "customers:erase": ["owner"],
  "keepcheck:read": STAFF_WITH_CUSTOMERS,
  "families:read": ALL,
  "families:edit": ["owner"],
  "prices:read": STAFF_WITH_CUSTOMERS,
  "quotes:send": STAFF_WITH_CUSTOMERS,
  "deposits:take": ["owner", "service_writer"],
  "deposits:refund": ["owner"],
  "jobs:edit": ["owner"],
  "schedule:edit": ["owner", "service_writer"],
} as const satisfies Record<string, readonly Role[]>;

export type Permission = keyof typeof PERMISSIONS;

export function can(role: Role | null | undefined, permission: Permission): boolean {
  if (!role) return false;
  return (PERMISSIONS[permission] as readonly Role[]).includes(role);
}

export function rolesWith(permission: Permission): Role[] {
  return [...PERMISSIONS[permission]];
}

export function isRole(value: unknown): value is Role {
  return typeof value === "string" && (ROLES as readonly string[]).includes(value);
}
