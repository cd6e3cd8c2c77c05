// The production server: static assets, then the React Router request handler.
// It differs from the stock server in one way: it tells the app the client's socket
// address (used by sign-in throttling) in a header that clients cannot set themselves.
//   node scripts/serve.mjs [build/server/index.js]
import cluster from "node:cluster";
import { randomBytes } from "node:crypto";
import path from "node:path";
import { fileURLToPath, pathToFileURL } from "node:url";
import { createRequestHandler } from "@react-router/express";
import compression from "compression";
import express from "express";
import morgan from "morgan";

export const CLIENT_ADDRESS_HEADER = "x-torquewright-client-address";

/** Whatever a client sent under CLIENT_ADDRESS_HEADER is replaced by what the socket says. */
export function clientAddressMiddleware(req, _res, next) {
  req.headers[CLIENT_ADDRESS_HEADER] = req.socket.remoteAddress ?? "";
  next();
}

/**
 * The Content-Security-Policy of a page whose inline scripts carry `nonce`: scripts and
 * styles only from our own origin or with this request's nonce (the framework's inline
 * hydration scripts and React's streaming scripts get it), no plugins, no framing.
 */
export function contentSecurityPolicy(nonce) {
  return [
    "default-src 'self'",
    `script-src 'self' 'nonce-${nonce}'`,
    `style-src 'self' 'nonce-${nonce}'`,
    "img-src 'self' data: blob:",
    "font-src 'self' data:",
    "connect-src 'self'",
    "object-src 'none'",
    "base-uri 'self'",
    "form-action 'self'",
    "frame-ancestors 'none'",
  ].join("; ");
}

/**
 * Security headers on every answer, and a fresh nonce for the page's inline scripts in
 * `res.locals.cspNonce` (the request handler hands it to the app's render). HSTS only
 * when the app is served over https (`APP_URL`).
 */
export function securityHeadersMiddleware(appUrl = process.env.APP_URL ?? "") {
  const https = appUrl.startsWith("https://");
  return (_req, res, next) => {
    const nonce = randomBytes(18).toString("base64");
    res.locals.cspNonce = nonce;
    res.setHeader("Content-Security-Policy", contentSecurityPolicy(nonce));
    res.setHeader("X-Content-Type-Options", "nosniff");
    res.setHeader("Referrer-Policy", "same-origin");
    res.setHeader("X-Frame-Options", "DENY");
    if (https) res.setHeader("Strict-Transport-Security", "max-age=31536000; includeSubDomains");
    next();
  };
}

async function main() {
  const buildPath = path.resolve(process.argv[2] ?? "build/server/index.js");
  const build = await import(pathToFileURL(buildPath).href);
  const clientDir = path.join(path.dirname(buildPath), "..", "client");
  const port = Number(process.env.PORT ?? 3000);
  const host = process.env.HOST ?? "127.0.0.1";

  const app = express();
  app.disable("x-powered-by");
  app.use(securityHeadersMiddleware());
  app.use(compression());
  app.use(
    "/assets",
    express.static(path.join(clientDir, "assets"), { immutable: true, maxAge: "1y" }),
  );
  app.use(express.static(clientDir, { maxAge: "1h" }));
  if (process.env.TW_ACCESS_LOG !== "0") app.use(morgan("tiny"));
  app.use(clientAddressMiddleware);
  app.all(
    "*",
    createRequestHandler({
      build,
      mode: process.env.NODE_ENV,
      getLoadContext: (_req, res) => ({ cspNonce: res.locals.cspNonce }),
    }),
  );

  const server = app.listen(port, host, () => {
    console.log(`torquewright: listening on http://${host}:${server.address().port}`);
  });
  for (const signal of ["SIGTERM", "SIGINT"]) {
    process.once(signal, () => server.close(() => process.exit(0)));
  }
}

// WEB_CONCURRENCY > 1 runs that many worker processes sharing the port (one per core is
// the usual choice); they keep no state of their own, like servers behind a balancer.
if (process.argv[1] && path.resolve(process.argv[1]) === fileURLToPath(import.meta.url)) {
  const workers = Math.max(1, Number(process.env.WEB_CONCURRENCY ?? 1) || 1);
  if (workers > 1 && cluster.isPrimary) {
    for (let i = 0; i < workers; i++) cluster.fork();
    let stopping = false;
    cluster.on("exit", (worker, code) => {
      if (!stopping) {
        console.error(
          `torquewright: worker ${worker.process.pid} stopped (${code}); starting another`,
        );
        cluster.fork();
      }
    });
    for (const signal of ["SIGTERM", "SIGINT"]) {
      process.once(signal, () => {
        stopping = true;
        for (const w of Object.values(cluster.workers ?? {})) w?.process.kill("SIGTERM");
        setTimeout(() => process.exit(0), 5000).unref();
        cluster.on("exit", () => {
          if (Object.keys(cluster.workers ?? {}).length === 0) process.exit(0);
        });
      });
    }
  } else {
    await main();
  }
}
