import { type RouteConfig, index, prefix, route } from "@react-router/dev/routes";

export default [
  index("routes/home.tsx"),

  route("sign-up", "routes/auth/sign-up.tsx"),
  route("sign-in", "routes/auth/sign-in.tsx"),
  route("sign-out", "routes/auth/sign-out.tsx"),
  route("forgot-password", "routes/auth/forgot-password.tsx"),
  route("reset-password", "routes/auth/reset-password.tsx"),
  route("account", "routes/auth/account.tsx"),

  ...prefix("tanks", [index("routes/tanks/list.tsx")]),

  ...prefix("admin", [index("routes/admin/users.tsx")]),

  route("dev/mail", "routes/dev/mail.tsx"),

  ...prefix("api", [route("health", "routes/api/health.ts")]),

  route("*", "routes/not-found.tsx"),
] satisfies RouteConfig;
