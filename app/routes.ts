import { type RouteConfig, index, route } from "@react-router/dev/routes";

export default [
  index("routes/home.tsx"),
  route("healthz", "routes/healthz.ts"),
  route("login", "routes/login.tsx"),
  route("logout", "routes/logout.ts"),
  route("invite/:token", "routes/invite.$token.tsx"),
  route("reset", "routes/reset.tsx"),
  route("reset/:token", "routes/reset.$token.tsx"),
  route("staff", "routes/staff.tsx"),
  route("dev/outbox", "routes/dev.outbox.tsx"),
  route("dev/outbox/:id", "routes/dev.outbox.$id.tsx"),
  route("packages", "routes/packages.tsx"),
  route("packages/new", "routes/packages.new.tsx"),
  route("packages/:id", "routes/packages.$id.tsx"),
  route("packages/:id/bench", "routes/packages.$id.bench.tsx"),
  route("api/parts", "routes/api.parts.ts"),
  route("api/packages/:id", "routes/api.packages.$id.ts"),
  route("api/calc", "routes/api.calc.ts"),
  route("*", "routes/not-found.tsx"),
] satisfies RouteConfig;
