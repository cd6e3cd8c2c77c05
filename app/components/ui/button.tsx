// The three looks of a button or a link that acts like one.
export type ButtonLook = "primary" | "secondary" | "quiet";

const LOOKS: Record<ButtonLook, string> = {
  primary: "bg-teal-dark text-white hover:bg-ink",
  secondary: "border border-teal-dark bg-white text-teal-text hover:bg-steel-50",
  quiet: "border border-steel-300 bg-white text-ink hover:bg-steel-100",
};

/** `wide`: the full width of its column, a little taller (the sign-in cards' buttons). */
export function buttonClass(
  look: ButtonLook = "primary",
  { wide = false, extra = "" }: { wide?: boolean; extra?: string } = {},
): string {
  return `${wide ? "block w-full py-2.5" : "inline-block py-2"} rounded px-4 font-semibold disabled:opacity-60 ${LOOKS[look]} ${extra}`.trim();
}

export function SubmitButton({
  children,
  busy,
  look = "primary",
  wide,
  name,
  value,
}: {
  children: React.ReactNode;
  busy?: boolean;
  look?: ButtonLook;
  wide?: boolean;
  name?: string;
  value?: string;
}) {
  return (
    <button
      type="submit"
      name={name}
      value={value}
      disabled={busy}
      className={buttonClass(look, { wide })}
    >
      {children}
    </button>
  );
}
