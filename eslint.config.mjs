import nextBase from "eslint-config-next";
import nextTs from "eslint-config-next/typescript";

const config = [
  ...nextBase,
  ...nextTs,
  // Next's stricter set: a plain <a> to a page, or a synchronous script, is an error, not a warning.
  {
    rules: {
      "@next/next/no-html-link-for-pages": "error",
      "@next/next/no-sync-scripts": "error",
    },
  },
  {
    ignores: [".next*/**", ".data/**", "node_modules/**", "public/sw/**", "next-env.d.ts", "test-results/**", "playwright-report/**"],
  },
  {
    rules: {
      "@typescript-eslint/no-unused-vars": ["error", { argsIgnorePattern: "^_", varsIgnorePattern: "^_" }],
    },
  },
  // SQL lives only in db/ (named functions in db/queries/*.ts). Elsewhere neither the query builder
  // nor the pool can be imported, and a transaction from `transaction()` (db/transaction.ts) is
  // only handed on to db/queries functions. Tests and scripts may use Knex directly.
  {
    files: ["**/*.{ts,tsx,js,mjs}"],
    ignores: ["db/**", "tests/**", "scripts/**", "knexfile.ts"],
    rules: {
      "no-restricted-imports": [
        "error",
        {
          paths: [
            { name: "knex", message: "SQL only in db/: add a named function to db/queries/<resource>.ts (types: Tx from @/db/transaction)." },
            { name: "mysql2", message: "SQL only in db/: add a named function to db/queries/<resource>.ts." },
            { name: "mysql2/promise", message: "SQL only in db/: add a named function to db/queries/<resource>.ts." },
          ],
          // "@/db/client" and relative paths alike.
          patterns: [{ group: ["**/db/client", "**/db/client.ts"], message: "The pool is db/'s own: call a db/queries function, or transaction() from @/db/transaction." }],
        },
      ],
      "no-restricted-syntax": [
        "error",
        {
          selector: "CallExpression[callee.type='Identifier'][callee.name=/^(db|knex|k|tx)$/]",
          message: "SQL only in db/: pass the transaction to a db/queries function instead of querying with it.",
        },
        {
          selector: "CallExpression[callee.type='MemberExpression'][callee.property.name=/^(where|andWhere|orWhere|whereIn|whereNotIn|whereNot|whereNull|whereNotNull|whereRaw|whereExists|raw|joinRaw|orderByRaw|havingRaw|forUpdate|forShare|onConflict)$/]",
          message: "Query-builder call outside db/: move it into a named function in db/queries/<resource>.ts.",
        },
      ],
    },
  },
];

export default config;
