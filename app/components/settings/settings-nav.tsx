// The sections of the owner's shop settings, one route each; add a section here when
// its route exists.
import { NavLink } from "react-router";

export const SETTINGS_SECTIONS = [
  { to: "/settings", label: "Shop details" },
  { to: "/settings/limits", label: "Caution limits" },
  { to: "/settings/jobs", label: "Labour jobs" },
] as const;

export function SettingsNav() {
  return (
    <nav aria-label="Shop settings" className="mt-4 border-b border-steel-200">
      <ul className="flex gap-1">
        {SETTINGS_SECTIONS.map((s) => (
          <li key={s.to}>
            <NavLink
              to={s.to}
              end
              className={({ isActive }) =>
                `-mb-px inline-block border-b-2 px-3 py-2 text-sm font-semibold ${
                  isActive
                    ? "border-teal-dark text-ink"
                    : "border-transparent text-steel-700 hover:text-ink"
                }`
              }
            >
              {s.label}
            </NavLink>
          </li>
        ))}
      </ul>
    </nav>
  );
}
