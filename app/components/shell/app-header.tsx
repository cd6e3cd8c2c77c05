import { Form, NavLink } from "react-router";
import { can, ROLE_LABELS, type Permission, type Role } from "~/lib/auth/permissions";

export type NavItem = { to: string; label: string };

// Each section is shown only to the roles that may use it (the same `can` the server asks).
// Add an entry here once its route exists.
const SECTIONS: (NavItem & { permission: Permission; localMailOnly?: boolean })[] = [
  { to: "/", label: "Home", permission: "home:read" },
  { to: "/requests", label: "Requests", permission: "requests:read" },
  { to: "/customers", label: "Customers", permission: "customers:read" },
  { to: "/packages", label: "Packages", permission: "packages:read" },
  { to: "/parts", label: "Parts", permission: "parts:read" },
  { to: "/engine-families", label: "Engines", permission: "families:read" },
  { to: "/rules", label: "Fit rules", permission: "rules:read" },
  { to: "/staff", label: "Staff", permission: "staff:manage" },
  { to: "/dev/outbox", label: "Outbox", permission: "outbox:read", localMailOnly: true },
];

export function navFor(role: Role | string | null, opts: { localMail?: boolean } = {}): NavItem[] {
  if (!role) return [];
  return SECTIONS.filter(
    (s) => can(role as Role, s.permission) && (!s.localMailOnly || opts.localMail),
  ).map(({ to, label }) => ({ to, label }));
}

export function AppHeader({
  user,
  localMail = false,
}: {
  user: { name: string; role: Role | string } | null;
  localMail?: boolean;
}) {
  const items = navFor(user?.role ?? null, { localMail });
  return (
    <header className="bg-ink text-steel-50 print:hidden">
      <div className="mx-auto flex max-w-7xl flex-wrap items-center gap-x-8 gap-y-2 px-4 py-3">
        <a href="/" className="flex items-center gap-2 text-xl font-bold tracking-wide">
          <LogoMark />
          <span>Torquewright</span>
        </a>
        <nav aria-label="Main" className="flex flex-1 flex-wrap gap-1">
          {items.map((item) => (
            <NavLink
              key={item.to}
              to={item.to}
              end={item.to === "/"}
              className={({ isActive }) =>
                `rounded px-3 py-1.5 text-sm font-medium ${
                  isActive
                    ? "bg-graphite text-white"
                    : "text-steel-100 hover:bg-graphite hover:text-white"
                }`
              }
            >
              {item.label}
            </NavLink>
          ))}
        </nav>
        {user ? (
          <div className="flex items-center gap-3">
            <p className="text-sm text-steel-100" aria-label="Signed in as">
              <span className="font-semibold text-white">{user.name}</span>{" "}
              <span className="text-steel-200">
                · {ROLE_LABELS[user.role as Role] ?? user.role}
              </span>
            </p>
            <Form method="post" action="/logout">
              <button
                type="submit"
                className="rounded border border-steel-500 px-3 py-1 text-sm font-medium text-steel-50 hover:bg-graphite"
              >
                Sign out
              </button>
            </Form>
          </div>
        ) : null}
      </div>
    </header>
  );
}

function LogoMark() {
  // A piston crown over a crank throw: the product's own mark.
  return (
    <svg viewBox="0 0 32 32" className="h-7 w-7" aria-hidden="true">
      <rect x="7" y="3" width="18" height="11" rx="2" fill="#0f8b8d" />
      <rect x="7" y="6" width="18" height="1.5" fill="#0d1b2a" />
      <path d="M16 14 L12 24" stroke="#c5ced8" strokeWidth="3" strokeLinecap="round" />
      <circle cx="16" cy="24" r="5.5" fill="none" stroke="#c5ced8" strokeWidth="2.5" />
      <circle cx="12" cy="24" r="1.8" fill="#f4f6f8" />
    </svg>
  );
}
