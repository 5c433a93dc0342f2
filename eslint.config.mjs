import next from "eslint-config-next/core-web-vitals";
import nextTs from "eslint-config-next/typescript";

/**
 * The layers, enforced (DEVELOPERS.md, "Where code goes"):
 * - the database (knex, and the instance from lib/data/db.ts) only in lib/data/, db/, the
 *   worker's entry and lib/server/db.ts; nobody else builds a query;
 * - the pure rules (lib/calc, lib/checklist, lib/jobs) free of the data layer, the server and React;
 * - client components ("use client") never import lib/server or lib/data.
 */
const DATA_HOMES = [
  "lib/data/**",
  "db/**",
  "lib/worker/main.ts",
  "lib/server/db.ts",
  "knexfile.ts",
];

const noDatabaseOutsideData = {
  files: ["**/*.ts", "**/*.tsx"],
  ignores: [...DATA_HOMES, "tests/**", "mocks/**"],
  rules: {
    "@typescript-eslint/no-restricted-imports": [
      "error",
      {
        paths: [
          { name: "knex", message: "Queries belong in lib/data/.", allowTypeImports: true },
          {
            name: "@/lib/data/db",
            importNames: ["getDb"],
            message:
              "Use db() from lib/server/db.ts in the app; the worker gets it from its entry.",
          },
        ],
      },
    ],
    "no-restricted-syntax": [
      "error",
      {
        selector: "CallExpression[callee.type='CallExpression'][callee.callee.name='db']",
        message: "Queries belong in lib/data/: call a lib/data function with db() instead.",
      },
      {
        selector: "MemberExpression[object.type='CallExpression'][object.callee.name='db']",
        message: "Queries belong in lib/data/: call a lib/data function with db() instead.",
      },
    ],
  },
};

const pureRules = {
  files: ["lib/calc/**", "lib/checklist/**", "lib/jobs/**"],
  rules: {
    "@typescript-eslint/no-restricted-imports": [
      "error",
      {
        patterns: [
          {
            group: [
              "@/lib/data/*",
              "@/lib/server/*",
              "knex",
              "react",
              "react-dom",
              "next",
              "next/*",
            ],
            message: "The pure rules stay free of the database, the server and React.",
          },
        ],
      },
    ],
  },
};

/** A client component's imports: nothing from lib/server or lib/data, not even types. */
const clientBoundary = {
  meta: { type: "problem", docs: { description: "client components import no server code" } },
  create(context) {
    const source = context.sourceCode ?? context.getSourceCode();
    const first = source.ast.body[0];
    const isClient =
      first?.type === "ExpressionStatement" && first.expression.value === "use client";
    if (!isClient) return {};
    return {
      ImportDeclaration(node) {
        const from = String(node.source.value);
        if (/^@\/lib\/(server|data)(\/|$)/.test(from))
          context.report({
            node,
            message: `A client component may not import ${from}: share types through lib/types/.`,
          });
      },
    };
  },
};

const config = [
  ...next,
  ...nextTs,
  // .stryker-tmp: the sandbox copies of a mutation run in progress.
  {
    ignores: [
      ".next/**",
      "node_modules/**",
      ".data/**",
      "next-env.d.ts",
      "coverage/**",
      ".stryker-tmp/**",
    ],
  },
  {
    plugins: { loopwright: { rules: { "client-boundary": clientBoundary } } },
    rules: {
      "@typescript-eslint/no-explicit-any": "error",
      "@typescript-eslint/no-unused-vars": [
        "error",
        { argsIgnorePattern: "^_", varsIgnorePattern: "^_" },
      ],
      "loopwright/client-boundary": "error",
    },
  },
  noDatabaseOutsideData,
  pureRules,
];

export default config;
