// Lint: Next.js and react-hooks rules, TypeScript, and the layer rules of the codebase:
// - the database (`@/models`) is reached only from lib/data, workers, models and tests (and lib/auth,
//   whose better-auth adapter is the data boundary of the sign-in tables);
// - components import only types from lib/data (data reaches them as props or through the API);
// - domain folders (computations) import neither the database nor the data layer.
import nextVitals from "eslint-config-next/core-web-vitals";
import nextTs from "eslint-config-next/typescript";

const models = { group: ["@/models", "@/models/*", "**/models", "**/models/*"], message: "Only lib/data, workers and migrations reach the database: go through lib/data." };
const dataLayer = { group: ["@/lib/data", "@/lib/data/*"], message: "Computations stay free of the data layer: take plain values as arguments." };
const domainFolders = ["analysis", "bike", "braking", "channels", "compare", "engine", "export", "findings", "gear", "geo", "ingest", "laps", "series", "slip", "stats", "suspension", "units"];

const config = [
  { ignores: ["node_modules/**", ".next/**", ".next-*/**", ".data/**", "test-output/**", "sample-logs/out/**", "next-env.d.ts"] },
  ...nextVitals,
  ...nextTs,
  {
    rules: {
      "@typescript-eslint/no-unused-vars": ["error", { argsIgnorePattern: "^_", varsIgnorePattern: "^_", caughtErrors: "none" }],
    },
  },
  {
    files: ["app/**", "components/**", "lib/**", "sample-logs/**"],
    ignores: ["lib/data/**", "lib/auth/**"],
    rules: { "no-restricted-imports": ["error", { patterns: [models] }] },
  },
  {
    files: ["components/**"],
    rules: {
      "@typescript-eslint/no-restricted-imports": [
        "error",
        { patterns: [models, { ...dataLayer, message: "Components import only types from lib/data.", allowTypeImports: true }] },
      ],
      "no-restricted-imports": "off",
    },
  },
  {
    files: domainFolders.map((d) => `lib/${d}/**`),
    rules: { "no-restricted-imports": ["error", { patterns: [models, dataLayer] }] },
  },
];

export default config;
