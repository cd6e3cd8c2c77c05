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
  route("*", "routes/not-found.tsx"),
] satisfies RouteConfig;
