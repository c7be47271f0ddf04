import next from "eslint-config-next";

const config = [
  ...next,
  { ignores: [".next/**", "node_modules/**", "data/**", "tests/.artifacts/**", "next-env.d.ts"] },
  {
    rules: {
      // Layering (DEVELOPERS.md): parsers and the engine stay pure.
      "no-restricted-imports": "off",
    },
  },
  {
    files: ["parsers/**/*.ts", "lib/kinetics/**/*.ts"],
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
