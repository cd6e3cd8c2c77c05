import { Link } from "react-router";

/** A page's title block: an optional way back, the title, a lead line, and actions on the right. */
export function PageHeader({
  back,
  eyebrow,
  title,
  lead,
  actions,
}: {
  back?: { to: string; label: string };
  eyebrow?: string;
  title: React.ReactNode;
  lead?: React.ReactNode;
  actions?: React.ReactNode;
}) {
  return (
    <div className="flex flex-wrap items-end justify-between gap-3">
      <div className="min-w-0">
        {back ? (
          <p className="text-sm">
            <Link to={back.to} className="text-teal-text underline">
              ← {back.label}
            </Link>
          </p>
        ) : null}
        {eyebrow ? (
          <p className="text-sm font-semibold uppercase tracking-widest text-steel-700">
            {eyebrow}
          </p>
        ) : null}
        <h1 className="mt-1 flex flex-wrap items-center gap-x-3 gap-y-1 break-words text-3xl font-semibold text-ink">
          {title}
        </h1>
        {lead ? <div className="mt-1 text-steel-700">{lead}</div> : null}
      </div>
      {actions ? <div className="flex flex-wrap gap-2">{actions}</div> : null}
    </div>
  );
}

/** A titled part of a page; the heading labels the region for screen readers. */
export function Section({
  id,
  title,
  children,
  as: Tag = "section",
}: {
  id: string;
  title: string;
  children: React.ReactNode;
  as?: "section" | "aside";
}) {
  return (
    <Tag aria-labelledby={id}>
      <h2 id={id} className="mb-2 text-lg font-semibold text-ink">
        {title}
      </h2>
      {children}
    </Tag>
  );
}
