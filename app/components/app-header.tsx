import { NavLink } from "react-router";

export type NavItem = { to: string; label: string };

// Later features add their sections here, each shown only to the roles that may use it.
export function navFor(_role: string | null): NavItem[] {
  return [{ to: "/", label: "Home" }];
}

export function AppHeader({ user }: { user: { name: string; role: string } | null }) {
  const items = navFor(user?.role ?? null);
  return (
    <header className="bg-ink text-steel-50">
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
                  isActive ? "bg-graphite text-white" : "text-steel-100 hover:bg-graphite hover:text-white"
                }`
              }
            >
              {item.label}
            </NavLink>
          ))}
        </nav>
        {user ? (
          <p className="text-sm text-steel-100">
            {user.name} <span className="text-steel-300">· {user.role.replace("_", " ")}</span>
          </p>
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
