// ESLint (flat config): TypeScript, the React hooks rules, and the layering of DEVELOPERS.md.
import { readdirSync } from "node:fs";
import js from "@eslint/js";
import reactHooks from "eslint-plugin-react-hooks";
import globals from "globals";
import tseslint from "typescript-eslint";

const features = readdirSync(new URL("./frontend/features", import.meta.url), { withFileTypes: true })
  .filter((d) => d.isDirectory())
  .map((d) => d.name);

// A side-effect import runs a module for what it registers; only styles and fonts may be loaded so.
const noSideEffectImports = {
  selector:
    "ImportDeclaration[specifiers.length=0][importKind!='type']:not([source.value=/\\.css$/]):not([source.value=/^@fontsource\\//])",
  message: "No side-effect imports: import what you use by name, or pass it in (styles and fonts excepted).",
};

const sharedStaysShared = [
  {
    group: ["@backend/*", "@frontend/*", "**/backend/**", "**/frontend/**"],
    message: "shared/ is used by both sides and imports neither backend/ nor frontend/.",
  },
];

export default tseslint.config(
  {
    ignores: ["dist/**", "data/**", "node_modules/**", "drizzle/**", "fonts/**", "coverage/**", "**/*.d.ts"],
  },
  js.configs.recommended,
  ...tseslint.configs.recommended,
  {
    languageOptions: {
      ecmaVersion: 2023,
      sourceType: "module",
      globals: { ...globals.node, ...globals.browser },
    },
    linterOptions: { reportUnusedDisableDirectives: "error" },
    rules: {
      "no-console": "error",
      "no-restricted-syntax": ["error", noSideEffectImports],
      "@typescript-eslint/no-unused-vars": [
        "error",
        { argsIgnorePattern: "^_", varsIgnorePattern: "^_", caughtErrors: "none", ignoreRestSiblings: true },
      ],
      "@typescript-eslint/consistent-type-imports": ["error", { fixStyle: "inline-type-imports", disallowTypeAnnotations: false }],
      "@typescript-eslint/no-import-type-side-effects": "error",
      "no-duplicate-imports": "off",
    },
  },
  {
    files: ["frontend/**/*.{ts,tsx}", "tests/frontend/**/*.{ts,tsx}", "tests/e2e/viewer-harness/**/*.{ts,tsx}"],
    plugins: { "react-hooks": reactHooks },
    rules: {
      "react-hooks/rules-of-hooks": "error",
      "react-hooks/exhaustive-deps": "error",
    },
  },
  {
    files: ["shared/**/*.ts"],
    rules: { "no-restricted-imports": ["error", { patterns: sharedStaysShared }] },
  },
  {
    files: ["backend/**/*.ts"],
    rules: {
      "no-restricted-imports": [
        "error",
        { patterns: [{ group: ["@frontend/*", "**/frontend/**"], message: "The server does not import the client." }] },
      ],
    },
  },
  {
    files: ["frontend/**/*.{ts,tsx}"],
    rules: {
      "no-restricted-imports": [
        "error",
        { patterns: [{ group: ["@backend/*", "**/backend/**"], message: "The client reaches the server only through the API." }] },
      ],
    },
  },
  // A feature uses another only through that feature's index.ts.
  ...features.map((feature) => ({
    files: [`frontend/features/${feature}/**/*.{ts,tsx}`],
    rules: {
      "no-restricted-imports": [
        "error",
        {
          patterns: [
            { group: ["@backend/*", "**/backend/**"], message: "The client reaches the server only through the API." },
            {
              regex: `^@frontend/features/(?!${feature}/)[^/]+/`,
              message: "Import another feature through its public surface, `@frontend/features/<name>` (its index.ts).",
            },
            { regex: "^(\\.\\./){2,}(?!\\.)", message: "Reach outside this feature through the @frontend alias, not a relative path." },
          ],
        },
      ],
    },
  })),
  // The inverse-normal coefficients are kept with every digit as published, though a double holds fewer.
  {
    files: ["shared/engine/distributions.ts"],
    rules: { "no-loss-of-precision": "off" },
  },
  // Where printing is the job: tests, the command-line tools, scripts.
  {
    files: ["tests/**", "backend/cli/**", "**/*.mjs", "**/*.config.{js,ts}"],
    rules: { "no-console": "off" },
  },
  {
    files: ["tests/**"],
    rules: {
      // tests read loosely shaped JSON responses
      "@typescript-eslint/no-explicit-any": "off",
      "@typescript-eslint/no-non-null-assertion": "off",
    },
  },
);
