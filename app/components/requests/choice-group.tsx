// A group of checkboxes or radios under one legend, with the field's errors beside it.
import type { FieldMetadata } from "@conform-to/react";
import { FieldErrors } from "~/components/ui/field";

// eslint-disable-next-line @typescript-eslint/no-explicit-any
type AnyField = FieldMetadata<any, any, any>;

export function ChoiceGroup({
  field,
  legend,
  options,
  type,
}: {
  field: AnyField;
  legend: string;
  options: readonly { value: string; label: string }[];
  type: "checkbox" | "radio";
}) {
  const initial = field.initialValue;
  const chosen = new Set(Array.isArray(initial) ? initial : initial ? [initial] : []);
  return (
    <fieldset aria-describedby={field.errors ? field.errorId : undefined}>
      <legend className="text-sm font-semibold text-graphite">{legend}</legend>
      <div className="mt-1 flex flex-wrap gap-x-5 gap-y-2">
        {options.map((o) => (
          <label key={o.value} className="flex items-center gap-2 text-base">
            <input
              type={type}
              name={field.name}
              value={o.value}
              defaultChecked={chosen.has(o.value)}
              className="h-5 w-5 accent-teal"
            />
            {o.label}
          </label>
        ))}
      </div>
      <FieldErrors id={field.errorId} errors={field.errors} />
    </fieldset>
  );
}
