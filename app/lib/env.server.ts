import { z } from "zod";

// Environment variables are read once, here. Only PUBLIC_ENV reaches the browser.
const EnvSchema = z.object({
  NODE_ENV: z.enum(["development", "production", "test"]).default("production"),
  DATABASE_URL: z
    .string()
    .min(1, "DATABASE_URL is required (npm start sets it for the local server)"),
  DATABASE_POOL_MAX: z.coerce.number().int().positive().default(10),
  APP_URL: z.string().url().default("http://127.0.0.1:3000"),
  // Signs the session cookie and the invite/reset links. The local default is made
  // once per data folder by scripts/local-env.sh; tests get a fixed one.
  SESSION_SECRET: z.string().min(32, "SESSION_SECRET must be at least 32 characters"),
  // X-Forwarded-For is believed only behind a proxy we run.
  TRUST_PROXY: z.enum(["0", "1"]).default("0"),
  SMTP_URL: z
    .string()
    .url()
    .default(`smtp://127.0.0.1:${process.env.TW_SMTP_PORT ?? "2526"}`),
  MAIL_FROM: z.string().default("Tallgrass Twin Works <shop@tallgrass.test>"),
  // Set only when the local mail catcher runs; turns on /dev/outbox.
  LOCAL_MAIL_API_URL: z.string().url().optional(),
  MAIL_RETRY_DELAY_SECONDS: z.coerce.number().int().positive().default(15),
  // The payment service. Locally scripts/local-env.sh points these at the fake in
  // scripts/services/payment-fake.ts; unset STRIPE_API_URL means the hosted service.
  STRIPE_SECRET_KEY: z.string().optional(),
  STRIPE_WEBHOOK_SECRET: z.string().optional(),
  STRIPE_API_URL: z.string().url().optional(),
  // "0" keeps this process from working the job queue (it still enqueues).
  JOBS_WORKER: z.enum(["0", "1"]).default("1"),
});

export type Env = z.infer<typeof EnvSchema>;

let cached: Env | undefined;

export function env(): Env {
  if (!cached) {
    const source = { ...process.env };
    if (source.NODE_ENV === "test" && !source.SESSION_SECRET)
      source.SESSION_SECRET = "test-only-session-secret-0123456789abcdef";
    const parsed = EnvSchema.safeParse(source);
    if (!parsed.success) {
      const problems = parsed.error.issues.map((i) => `${i.path.join(".")}: ${i.message}`);
      throw new Error(`Invalid environment:\n  ${problems.join("\n  ")}`);
    }
    cached = parsed.data;
  }
  return cached;
}

export const isDevelopment = () => env().NODE_ENV === "development";

// Object storage for uploads (dyno runs, build photos): read apart from the rest, so the
// demo seed (which has no session secret) can store its files too. Locally the S3 fake
// that scripts/local-services.ts starts; in production the hosted service.
const S3EnvSchema = z.object({
  S3_ENDPOINT: z
    .string()
    .url()
    .default(`http://127.0.0.1:${process.env.TW_S3_PORT ?? "2528"}`),
  S3_REGION: z.string().min(1).default("us-east-1"),
  S3_BUCKET: z.string().min(3).default("torquewright"),
  S3_ACCESS_KEY_ID: z.string().min(1).default("S3RVER"),
  S3_SECRET_ACCESS_KEY: z.string().min(1).default("S3RVER"),
  // "1" for stores that want bucket-in-path addresses (the local fake does)
  S3_FORCE_PATH_STYLE: z.enum(["0", "1"]).default("1"),
});

let cachedS3: z.infer<typeof S3EnvSchema> | undefined;

export function s3Env(): z.infer<typeof S3EnvSchema> {
  cachedS3 ??= S3EnvSchema.parse(process.env);
  return cachedS3;
}
