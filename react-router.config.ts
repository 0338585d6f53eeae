import type { Config } from "@react-router/dev/config";

export default {
  ssr: true,
  // The whole route manifest goes to the browser as one fingerprinted, cached file instead of a
  // partial manifest worked out and inlined into every page (about 5 kB and 0.3 ms per render).
  routeDiscovery: { mode: "initial" },
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
