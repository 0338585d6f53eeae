// One preset: typescript-eslint's recommended rules, plus the React hooks rules for app/, plus
// import rules that keep the layers apart (docs/decisions/0008-feature-folders.md).
import js from "@eslint/js";
import reactHooks from "eslint-plugin-react-hooks";
import globals from "globals";
import tseslint from "typescript-eslint";

/** Import patterns refused in some layer; a file's rule lists every pattern of its layers. */
const RELATIVE = {
  regex: "^\\.{1,2}/(?!\\+types/)",
  message: "Import app code as ~/… and the engine as ~models (only ./+types/… stays relative).",
};
const ENGINE_INSIDES = {
  regex: "^~models/(?!units$|nitrogen/calibrate$)",
  message: "Use the engine's entry points: ~models, ~models/units (client-safe units) or ~models/nitrogen/calibrate.",
};
const SERVER_MODULE = {
  regex: "\\.server$",
  message: "Browser code imports no *.server module, not even its types: move shared types to a client-safe module.",
};
const COMPONENTS = {
  regex: "^~/components/",
  message:
    "Server code imports nothing from components/: shared helpers and data shapes live in app/utils or a feature's client-safe module.",
};
const APP = {
  regex: "^(~/|~models|(\\.\\./)+app/)",
  message: "The engine imports nothing from the web app.",
};
const FRAMEWORK = {
  regex: "^(react|react-dom|react-router|@react-router/.*|drizzle-orm.*|better-sqlite3)$",
  message: "The engine is framework-free: no React, router or database.",
};
const NODE = { regex: "^node:", message: "The engine does no I/O (only the command-line runner may use node:*)." };

const restrict = (...patterns) => ({ "no-restricted-imports": ["error", { patterns }] });

export default tseslint.config(
  {
    ignores: [
      "build/",
      "build-*/",
      ".react-router/",
      "node_modules/",
      "test-results/",
      "data/",
      "drizzle/",
      "coverage/",
    ],
  },
  js.configs.recommended,
  ...tseslint.configs.recommended,
  {
    languageOptions: { globals: { ...globals.node, ...globals.browser } },
    rules: {
      "@typescript-eslint/no-unused-vars": [
        "error",
        { argsIgnorePattern: "^_", varsIgnorePattern: "^_", destructuredArrayIgnorePattern: "^_" },
      ],
      "@typescript-eslint/no-explicit-any": "off",
      "no-console": "off",
    },
  },
  // Route modules (and the shell) may import server modules: React Router keeps loaders and
  // actions out of the browser bundle. One import style everywhere in app/.
  { files: ["app/**/*.{ts,tsx}"], ignores: ["app/routes.ts"], rules: restrict(RELATIVE, ENGINE_INSIDES) },
  // Browser code: components, isomorphic helpers and the features' client-safe modules.
  {
    files: ["app/components/**", "app/utils/**", "app/features/**"],
    ignores: ["**/*.server.ts"],
    rules: restrict(RELATIVE, ENGINE_INSIDES, SERVER_MODULE),
  },
  // Server code.
  { files: ["app/**/*.server.{ts,tsx}", "app/db/**"], rules: restrict(RELATIVE, ENGINE_INSIDES, COMPONENTS) },
  { files: ["server/**"], rules: restrict(COMPONENTS) },
  // The engine.
  { files: ["models/**"], rules: restrict(APP, FRAMEWORK, NODE) },
  { files: ["models/cli.ts"], rules: restrict(APP, FRAMEWORK) },
  {
    files: ["app/**/*.tsx"],
    plugins: { "react-hooks": reactHooks },
    rules: {
      "react-hooks/rules-of-hooks": "error",
      "react-hooks/exhaustive-deps": "warn",
    },
  },
);
