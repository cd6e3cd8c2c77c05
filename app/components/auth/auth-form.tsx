// The card the sign-in, invite and reset screens sit in. Their fields, alerts and
// buttons are the shared primitives of app/components/ui.
export function AuthCard({
  title,
  lead,
  children,
}: {
  title: string;
  lead?: React.ReactNode;
  children: React.ReactNode;
}) {
  return (
    <main className="mx-auto max-w-md px-4 py-12">
      <div className="rounded-lg border border-steel-200 bg-white p-6 shadow-sm">
        <h1 className="text-2xl font-semibold text-ink">{title}</h1>
        {lead ? <div className="mt-1 text-steel-700">{lead}</div> : null}
        <div className="mt-6">{children}</div>
      </div>
    </main>
  );
}
