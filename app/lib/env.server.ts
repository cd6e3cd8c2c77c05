import { z } from "zod";

// Environment variables are read once, here. Only PUBLIC_ENV reaches the browser.
const EnvSchema = z.object({
  NODE_ENV: z.enum(["development", "production", "test"]).default("production"),
  DATABASE_URL: z.string().min(1, "DATABASE_URL is required (npm start sets it for the local server)"),
  DATABASE_POOL_MAX: z.coerce.number().int().positive().default(10),
  APP_URL: z.string().url().default("http://127.0.0.1:3000"),
});

export type Env = z.infer<typeof EnvSchema>;

let cached: Env | undefined;

export function env(): Env {
  if (!cached) {
    const parsed = EnvSchema.safeParse(process.env);
    if (!parsed.success) {
      const problems = parsed.error.issues.map((i) => `${i.path.join(".")}: ${i.message}`);
      throw new Error(`Invalid environment:\n  ${problems.join("\n  ")}`);
    }
    cached = parsed.data;
  }
  return cached;
}

export const isDevelopment = () => env().NODE_ENV === "development";
