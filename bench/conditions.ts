// Imported first by bench/sync.ts, before the server's code: server/sync/apply.ts starts with
// `import "server-only"`, which throws outside Next unless Node resolves the `react-server`
// export condition. Says how to run the bench instead of that error.
const args = [...process.execArgv, ...(process.env.NODE_OPTIONS ?? "").split(/\s+/)];
const reactServer = args.some(
  (a, i) =>
    a === "--conditions=react-server" ||
    a === "-C=react-server" ||
    ((a === "--conditions" || a === "-C") && args[i + 1] === "react-server"),
);
if (!reactServer) {
  console.error("Run the bench with the react-server condition (README, Performance):");
  console.error("  node --conditions react-server --import tsx bench/sync.ts [push|tap|all]");
  process.exit(2);
}

export {};
