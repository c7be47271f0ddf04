import next from "eslint-config-next";

const config = [
  ...next,
  { ignores: [".next/**", "node_modules/**", "data/**", "tests/.artifacts/**", "next-env.d.ts"] },
  {
    files: ["parsers/**/*.ts", "lib/kinetics/**/*.ts"],
    ignores: ["**/*.test.ts"],
    rules: {
      "no-restricted-imports": ["error", { patterns: ["@/db/*", "@/db", "next/*", "react", "react-dom", "knex", "better-sqlite3", "node:fs"] }],
    },
  },
  {
    files: ["app/**/*.ts", "app/**/*.tsx", "components/**/*.tsx"],
    rules: {
      "no-restricted-imports": ["error", { patterns: ["@/db/queries/*", "knex"] }],
    },
  },
];

export default config;
