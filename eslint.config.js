// One preset: typescript-eslint's recommended rules, plus the React hooks rules for app/.
import js from "@eslint/js";
import reactHooks from "eslint-plugin-react-hooks";
import globals from "globals";
import tseslint from "typescript-eslint";

export default tseslint.config(
  { ignores: ["build/", "build-*/", ".react-router/", "node_modules/", "test-results/", "data/", "drizzle/", "coverage/"] },
  js.configs.recommended,
  ...tseslint.configs.recommended,
  {
    languageOptions: { globals: { ...globals.node, ...globals.browser } },
    rules: {
      "@typescript-eslint/no-unused-vars": ["error", { argsIgnorePattern: "^_", varsIgnorePattern: "^_", destructuredArrayIgnorePattern: "^_" }],
      "@typescript-eslint/no-explicit-any": "off",
      "no-console": "off",
    },
  },
  {
    // One import style in the web app: ~/ for app code, ~models for the engine; relative paths
    // only for React Router's generated ./+types (docs/decisions/0008-feature-folders.md).
    files: ["app/**/*.{ts,tsx}"],
    ignores: ["app/routes.ts"],
    rules: {
      "no-restricted-imports": [
        "error",
        {
          patterns: [
            {
              regex: "^\\.{1,2}/(?!\\+types/)",
              message: "Import app code as ~/… and the engine as ~models (only ./+types/… stays relative).",
            },
          ],
        },
      ],
    },
  },
  {
    files: ["app/**/*.tsx"],
    plugins: { "react-hooks": reactHooks },
    rules: {
      "react-hooks/rules-of-hooks": "error",
      "react-hooks/exhaustive-deps": "warn",
    },
  },
);
