import { HONEYPOT_STAMP, HONEYPOT_TRAP, type HoneypotStamp } from "~/lib/auth/honeypot";

/** The hidden fields a public form carries (checked by trippedHoneypot on the server). */
export function Honeypot({ stamp }: HoneypotStamp) {
  return (
    <div aria-hidden="true" className="absolute -left-[9999px] h-px w-px overflow-hidden">
      <label htmlFor={`hp-${HONEYPOT_TRAP}`}>Leave this empty</label>
      <input
        id={`hp-${HONEYPOT_TRAP}`}
        name={HONEYPOT_TRAP}
        type="text"
        tabIndex={-1}
        autoComplete="off"
        defaultValue=""
      />
      <input type="hidden" name={HONEYPOT_STAMP} value={stamp} />
    </div>
  );
}
