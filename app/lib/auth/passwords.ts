import { z } from "zod";

export const MIN_PASSWORD_LENGTH = 10;

// New passwords: long enough to resist guessing, typed twice.
export const NewPasswordFields = {
  password: z
    .string("Choose a password.")
    .min(MIN_PASSWORD_LENGTH, `Use at least ${MIN_PASSWORD_LENGTH} characters.`)
    .max(200, "Use at most 200 characters."),
  confirm: z.string("Type the password again."),
};

export function passwordsMatch(v: { password: string; confirm: string }, ctx: z.RefinementCtx) {
  if (v.password !== v.confirm)
    ctx.addIssue({ code: "custom", path: ["confirm"], message: "The two passwords differ." });
}
