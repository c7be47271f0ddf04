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
  {
    // Response bodies are read in lib/http only (typed: sendJson/useSend, the fetchers, FetchError with the server's
    // problem); a component that fetched and read .json() itself would hold an untyped body.
    files: ["components/**/*.ts", "components/**/*.tsx"],
    rules: {
      "no-restricted-syntax": [
        "error",
        { selector: "CallExpression[callee.name='fetch']", message: "Send and read through lib/http (sendJson, useSend, the fetchers): typed, with the server's problem and network failures handled." },
        { selector: "CallExpression[callee.property.name='json']", message: "A response body is read in lib/http only, typed; use sendJson, useSend or a fetcher." },
      ],
    },
  },
];

export default config;
