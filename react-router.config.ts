import type { Config } from "@react-router/dev/config";

export default {
  ssr: true,
  // A separate build folder per working copy or tool (FERNWATER_BUILD_DIR) keeps parallel builds apart.
  buildDirectory: process.env.FERNWATER_BUILD_DIR ?? "build",
  future: {
    v8_middleware: true,
    v8_splitRouteModules: true,
    v8_viteEnvironmentApi: true,
    v8_passThroughRequests: true,
    v8_trailingSlashAwareDataRequests: true,
  },
} satisfies Config;
