// The direction of imports (DEVELOPERS.md, "Layers"): app → components → lib, and
// app/api → server → db → lib. `npm test` runs this; a forbidden import fails the suite.
/** @type {import('dependency-cruiser').IConfiguration} */
module.exports = {
  forbidden: [
    {
      name: "lib-is-pure",
      comment:
        "lib/ is the domain the tablet, the server and the tests share: no framework, database, server or Node-only module.",
      severity: "error",
      from: { path: "^lib/" },
      to: {
        path: [
          "^app/",
          "^components/",
          "^db/",
          "^server/",
          "^node_modules/(next|next-auth|drizzle-orm|@electric-sql/pglite|nodemailer|bcryptjs|server-only)/",
        ],
      },
    },
    {
      name: "lib-no-node-builtins",
      comment: "lib/ runs in the browser too: no node: modules.",
      severity: "error",
      from: { path: "^lib/" },
      to: { dependencyTypes: ["core"] },
    },
    {
      name: "db-below-server",
      comment: "db/ (schema, migrations, queries) knows nothing of HTTP, sessions or screens.",
      severity: "error",
      from: { path: "^db/" },
      to: { path: ["^app/", "^components/", "^server/", "^node_modules/(next|next-auth)/"] },
    },
    {
      name: "server-below-app",
      comment: "server/ (auth, route wrapper, services) is called by app/ and never calls up into it.",
      severity: "error",
      from: { path: "^server/" },
      to: { path: ["^app/", "^components/"] },
    },
    {
      name: "components-are-ui",
      comment: "components/ talk to the server only over HTTP (and to the tablet store in lib/local).",
      severity: "error",
      from: { path: "^components/" },
      to: { path: ["^app/", "^db/", "^server/"] },
    },
    {
      name: "no-cycles",
      severity: "error",
      from: {},
      to: { circular: true },
    },
  ],
  options: {
    doNotFollow: { path: "node_modules" },
    exclude: { path: ["^\\.next", "^db/migrations"] },
    tsConfig: { fileName: "tsconfig.json" },
    tsPreCompilationDeps: true,
    enhancedResolveOptions: {
      exportsFields: ["exports"],
      conditionNames: ["import", "require", "node", "default", "types"],
    },
  },
};
