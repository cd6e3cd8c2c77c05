// The local fakes of the hosted services, in one process on loopback.
// Each service registers itself below; the process writes a ready file listing what runs.
import { writeFileSync } from "node:fs";
import path from "node:path";
import { startMailCatcher } from "./services/mail-catcher";
import { startS3Fake } from "./services/s3-fake";
import { startPaymentFake } from "./services/payment-fake";

type Started = { name: string; url: string; stop: () => Promise<void> };
type Starter = () => Promise<Started>;

const starters: Starter[] = [
  async () => {
    const mail = await startMailCatcher({
      smtpPort: Number(process.env.TW_SMTP_PORT ?? 2526),
      apiPort: Number(process.env.TW_MAIL_API_PORT ?? 2527),
    });
    return { name: "mail (smtp, api)", url: `${mail.smtpUrl}, ${mail.apiUrl}`, stop: mail.stop };
  },
  async () => {
    const dataDir = process.env.TW_DATA_DIR ?? path.resolve(".data");
    const s3 = await startS3Fake({
      port: Number(process.env.TW_S3_PORT ?? 2528),
      directory: process.env.TW_S3_DIR ?? path.join(dataDir, "s3"),
      bucket: process.env.S3_BUCKET ?? "torquewright",
    });
    return { name: `object storage (bucket ${s3.bucket})`, url: s3.url, stop: s3.stop };
  },
  async () => {
    const pay = await startPaymentFake({
      port: Number(process.env.TW_PAY_PORT ?? 2529),
      webhookSecret: process.env.STRIPE_WEBHOOK_SECRET ?? "whsec_local",
      webhookUrl: process.env.TW_PAY_WEBHOOK_URL || undefined,
    });
    return { name: "payments (test checkout)", url: pay.url, stop: pay.stop };
  },
];

async function main() {
  const runDir = process.env.TW_RUN_DIR ?? path.resolve(".data/run");
  const started: Started[] = [];
  for (const start of starters) started.push(await start());
  const lines = started.map((s) => `services: ${s.name} on ${s.url}`);
  writeFileSync(
    path.join(runDir, "services.ready"),
    (lines.join("\n") || "services: none configured") + "\n",
  );
  const stop = async () => {
    await Promise.allSettled(started.map((s) => s.stop()));
    process.exit(0);
  };
  process.on("SIGTERM", stop);
  process.on("SIGINT", stop);
  // Keep the process alive even when no service holds a socket open.
  setInterval(() => {}, 1 << 30);
}

main().catch((e) => {
  console.error(e);
  process.exit(1);
});
