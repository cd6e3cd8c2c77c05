import { ReferencePanel } from "./reference-panel";

/** A fit-rule page: its content, and the reference of names and functions beside it. */
export function WithReference({ children }: { children: React.ReactNode }) {
  return (
    <div className="mt-6 grid gap-8 lg:grid-cols-[1fr_26rem]">
      {children}
      <aside>
        <ReferencePanel />
      </aside>
    </div>
  );
}
