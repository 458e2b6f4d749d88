import nextVitals from "eslint-config-next/core-web-vitals";
import nextTs from "eslint-config-next/typescript";

const config = [
  ...nextVitals,
  ...nextTs,
  {
    ignores: [".next/**", ".next-*/**", "node_modules/**", "data/**", "next-env.d.ts", "test-results/**"],
  },
  {
    rules: {
      "@typescript-eslint/no-unused-vars": ["error", { argsIgnorePattern: "^_", varsIgnorePattern: "^_" }],
    },
  },
  {
    // Migrations are frozen in time and written against Kysely<any>, never the app's schema types.
    files: ["migrations/**/*.ts", "db/migrator.ts"],
    rules: { "@typescript-eslint/no-explicit-any": "off" },
  },
];

export default config;
