// The names and functions a condition may use, printed from the lists the checker allows.
import { FUNCTIONS, OPERATORS_DOC, SLOT_OBJECTS, TOP_LEVEL_NAMES } from "~/lib/fit-rules/names";

export function ReferencePanel() {
  return (
    <section
      aria-labelledby="ref-h"
      className="rounded border border-steel-200 bg-white p-4 text-sm"
    >
      <h2 id="ref-h" className="text-lg font-semibold text-ink">
        What a condition can use
      </h2>
      <p className="mt-1 text-steel-700">
        A condition is checked against every package. It may use only these names; anything else is
        refused before the rule is saved. A value that a package does not have (an empty slot, a
        number not computed yet) makes the rule report “could not be checked” — guard with{" "}
        <code className="font-mono">filled("slot")</code> or{" "}
        <code className="font-mono">known(x)</code>.
      </p>
      <details className="mt-3" open>
        <summary className="cursor-pointer font-semibold text-ink">Package numbers</summary>
        <table className="mt-2 w-full">
          <tbody>
            {TOP_LEVEL_NAMES.map((n) => (
              <tr key={n.name} className="border-t border-steel-100 align-top">
                <td className="py-1 pr-3 font-mono text-ink">{n.name}</td>
                <td className="py-1 pr-3 text-steel-700">
                  {n.unit || (n.type === "text" ? "text" : "")}
                </td>
                <td className="py-1 text-graphite">{n.description}</td>
              </tr>
            ))}
          </tbody>
        </table>
      </details>
      <details className="mt-3">
        <summary className="cursor-pointer font-semibold text-ink">
          Slots and their attributes
        </summary>
        <p className="mt-1 text-steel-700">
          Write the slot, a dot and the attribute: <code className="font-mono">gasket.bore_mm</code>
          .
        </p>
        <dl className="mt-2 space-y-2">
          {SLOT_OBJECTS.map((s) => (
            <div key={s.key} className="border-t border-steel-100 pt-1">
              <dt className="font-mono font-semibold text-ink">
                {s.key} <span className="font-sans font-normal text-steel-700">— {s.label}</span>
              </dt>
              <dd className="text-graphite">
                {s.fields.map((f, i) => (
                  <span key={f.name}>
                    {i > 0 ? ", " : ""}
                    <code className="font-mono">{f.name}</code>
                    {f.unit ? (
                      <span className="text-steel-700"> ({f.unit})</span>
                    ) : f.type !== "number" ? (
                      <span className="text-steel-700"> ({f.type})</span>
                    ) : null}
                  </span>
                ))}
              </dd>
            </div>
          ))}
        </dl>
      </details>
      <details className="mt-3" open>
        <summary className="cursor-pointer font-semibold text-ink">Functions</summary>
        <ul className="mt-2 space-y-1">
          {FUNCTIONS.map((f) => (
            <li key={f.name}>
              <code className="font-mono text-ink">{f.signature}</code>{" "}
              <span className="text-graphite">— {f.description}</span>
            </li>
          ))}
        </ul>
      </details>
      <details className="mt-3">
        <summary className="cursor-pointer font-semibold text-ink">Operators</summary>
        <ul className="mt-2 space-y-1">
          {OPERATORS_DOC.map((o) => (
            <li key={o.text}>
              <code className="font-mono text-ink">{o.text}</code>{" "}
              <span className="text-graphite">— {o.description}</span>
            </li>
          ))}
        </ul>
        <p className="mt-2 text-steel-700">
          Not allowed: assignment, defining functions, units, lists, matrices, ranges, stacked
          powers, and any name not listed here.
        </p>
      </details>
    </section>
  );
}
