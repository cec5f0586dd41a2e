// Sync benchmarks, run by hand (never in the tests): prints figures and ratios.
//   node --conditions react-server --import tsx bench/sync.ts [push|tap|all]
// 1. push: 10,000 entries queued on a tablet (the real store on fake-indexeddb) pushed through
//    the real sync client and the server's push code into PGlite, in process, and the server's
//    share of it. Goal: at most 2× the raw insert of the same rows (see rawInserts below).
// 2. tap (needs a production build, NEXT_DIST_DIR, default .next-bench): in headless Chromium,
//    the time from a tap on "Save note" to the entry committed in IndexedDB with strict
//    durability, back to back and at a working pace. Goal: p95 < 30 ms. Then the same 10,000
//    entries pushed from Chromium over HTTP until nothing is pending, against the raw inserts.
// The tablet, the people and the entries come from tests/support, and the app server is started
// by the browser tests' harness (tests/support/server.ts: its own port, data, files and keys).
// `--conditions react-server`: server/sync/apply.ts starts with `import "server-only"`, which
// throws anywhere else outside Next; bench/conditions.ts says so first.
import "./conditions";
import { readdirSync, readFileSync, writeFileSync } from "node:fs";
import { join } from "node:path";
import { inArray, sql } from "drizzle-orm";
import { openDb } from "@/db/client";
import { toColumns } from "@/db/queries/entries";
import { entries } from "@/db/schema";
import { seedIfEmpty } from "@/db/seed";
import { type EntryDraft, recordEntriesIn } from "@/lib/local/store";
import { syncOnce } from "@/lib/sync/client";
import { PUSH_LIMITS } from "@/lib/sync/protocol";
import { CHROMIUM_ARGS, chromiumPath } from "@/tests/e2e/support/chromium";
import { ROOT } from "@/tests/support/dirs";
import { entryInput, readingDraft } from "@/tests/support/entries";
import { assertBuildExists, startServer, stopServer, waitForHealth } from "@/tests/support/server";
import { inProcessServer, registeredTablet } from "@/tests/support/tablet";
import { DEMO_PASSWORD, tomasz } from "@/tests/support/users";

const N = Number(process.env.BENCH_N) || 10_000;
const ms = (t: number) => `${t.toFixed(0)} ms`;

type EntryRowIn = typeof entries.$inferInsert;

/**
 * The raw baselines: the same rows inserted into a fresh (seeded) PGlite in one transaction,
 * (a) as multi-row INSERT … VALUES statements of 200 rows (Drizzle), the plain batched insert;
 * (b) as one INSERT … SELECT FROM json_populate_recordset per 500 rows, the fastest raw way
 * found here (and the way the server itself inserts a pushed batch).
 */
async function rawInserts(rows: EntryRowIn[]): Promise<{ valuesMs: number; jsonMs: number }> {
  // Each baseline three times on a fresh database; the median is reported (a single insert of
  // this size varies by ±30 % from run to run on a 2-core machine).
  const median = (xs: number[]) => [...xs].sort((x, y) => x - y)[Math.floor(xs.length / 2)]!;
  const records = rows.map(toColumns);
  const values: number[] = [];
  const json: number[] = [];
  for (let round = 0; round < 3; round++) {
    const a = await openDb();
    await seedIfEmpty(a);
    // Seeded entries occupy low seq numbers and hashes in both databases; the pushed rows do not clash.
    let t = performance.now();
    await a.transaction(async (tx) => {
      for (let i = 0; i < rows.length; i += 200) await tx.insert(entries).values(rows.slice(i, i + 200));
    });
    values.push(performance.now() - t);
    await a.$client.close();
    const b = await openDb();
    await seedIfEmpty(b);
    t = performance.now();
    await b.transaction(async (tx) => {
      for (let i = 0; i < records.length; i += 500) {
        await tx.execute(
          sql`insert into ${entries} select * from json_populate_recordset(null::${entries}, ${JSON.stringify(records.slice(i, i + 500))}::json)`,
        );
      }
    });
    json.push(performance.now() - t);
    const [{ n } = { n: 0 }] = await b
      .select({ n: sql<number>`count(*)::int` })
      .from(entries)
      .where(
        inArray(
          entries.id,
          rows.slice(0, 1000).map((r) => r.id),
        ),
      );
    if (n !== Math.min(1000, rows.length)) throw new Error("the JSON baseline did not insert the rows");
    await b.$client.close();
  }
  return { valuesMs: median(values), jsonMs: median(json) };
}

function report(what: string, ms_: number, raw: { valuesMs: number; jsonMs: number }, n: number) {
  console.log(`${what}: ${ms(ms_)}`);
  console.log(
    `raw batched INSERT … VALUES (200 rows a statement) of the same ${n} rows, median of 3:  ${ms(raw.valuesMs)}  → ratio ${(ms_ / raw.valuesMs).toFixed(2)}× (goal ≤ 2×)`,
  );
  console.log(
    `raw INSERT … json_populate_recordset (500 rows a statement), median of 3:            ${ms(raw.jsonMs)}  → ratio ${(ms_ / raw.jsonMs).toFixed(2)}×`,
  );
}

async function benchPush() {
  const db = await openDb();
  await seedIfEmpty(db);
  const tablet = await registeredTablet(db, tomasz, "bench");
  const stages = ["pt1", "pt2", "still", "cold", "mxc"];
  for (let i = 0; i < N; i += 500) {
    const drafts: EntryDraft[] = Array.from({ length: Math.min(500, N - i) }, (_, j) =>
      readingDraft({
        cryostatId: (i + j) % 3 === 0 ? "wren" : "heron",
        stage: stages[(i + j) % 5]!,
        value: 0.01 + ((i + j) % 97) / 1000,
      }),
    );
    await recordEntriesIn(tablet, drafts);
  }
  // Bodies and answers go through JSON as over HTTP; pull is not part of this figure (the server
  // answers "nothing new"); `stats.applyMs` is the server's own time in applyPush.
  const { transport, stats } = inProcessServer(db, tomasz, { pull: "nothing-new" });
  const t0 = performance.now();
  await syncOnce(tablet, transport, { maxBatch: PUSH_LIMITS.maxEntries, maxBytes: PUSH_LIMITS.maxBytes });
  const pushMs = performance.now() - t0;
  const left = await tablet.outbox.count();
  if (left !== 0) throw new Error(`${left} entries still queued`);

  // The same rows, as stored, inserted raw into a fresh database.
  const ids = (await tablet.entries.toArray()).map((e) => e.id);
  const rows = [];
  for (let i = 0; i < ids.length; i += 1000)
    rows.push(
      ...(await db
        .select()
        .from(entries)
        .where(inArray(entries.id, ids.slice(i, i + 1000)))),
    );
  const raw = await rawInserts(rows);
  report(`push ${N} queued entries (client on fake-indexeddb + server, in process)`, pushMs, raw, rows.length);
  report(`  of which the server's apply (validate, role check, hash chain, insert)`, stats.applyMs, raw, rows.length);
  await db.$client.close();
}

/**
 * CPU seconds (user + system) used so far by each process under `root` (Linux /proc), keyed by
 * what it is: Chromium's `--type=` (renderer, utility…) or the program's name.
 */
function cpuByProcess(root: number): Map<string, number> {
  const stats = new Map<number, { ppid: number; ticks: number; what: string }>();
  for (const d of readdirSync("/proc")) {
    if (!/^\d+$/.test(d)) continue;
    try {
      // Fields after the command's closing parenthesis: state ppid … utime(14) stime(15).
      const [head, rest] = readFileSync(`/proc/${d}/stat`, "utf8").split(") ") as [string, string];
      const f = rest.split(" ");
      const cmd = readFileSync(`/proc/${d}/cmdline`, "utf8");
      const what =
        /--type=([a-z-]+)/.exec(cmd)?.[1] ?? /--utility-sub-type=([\w.]+)/.exec(cmd)?.[1] ?? head.split(" (")[1]!;
      stats.set(Number(d), { ppid: Number(f[1]), ticks: Number(f[11]) + Number(f[12]), what });
    } catch {
      /* gone meanwhile */
    }
  }
  const out = new Map<string, number>();
  for (const [pid, s] of stats) {
    for (let p = pid; p > 1; p = stats.get(p)?.ppid ?? 0) {
      if (p === root) {
        out.set(s.what, (out.get(s.what) ?? 0) + s.ticks / 100); // USER_HZ
        break;
      }
    }
  }
  return out;
}

async function waitPendingZero(page: import("playwright-core").Page, timeout = 120_000) {
  await page.waitForFunction(
    () => document.querySelector('[data-testid="sync-indicator"]')?.getAttribute("data-pending") === "0",
    undefined,
    { timeout, polling: 50 },
  );
}

async function fetchCursor(page: import("playwright-core").Page): Promise<number> {
  let since = 0;
  for (;;) {
    const body = (await (await page.request.get(`/api/sync/pull?since=${since}`)).json()) as {
      cursor: number;
      hasMore: boolean;
    };
    since = body.cursor;
    if (!body.hasMore) return since;
  }
}

async function benchTap() {
  const { chromium } = await import("playwright-core");
  const dist = process.env.NEXT_DIST_DIR || ".next-bench";
  assertBuildExists(
    ROOT,
    dist,
    "the tap bench serves a production build, but",
    " (or set NEXT_DIST_DIR to the build to use)",
  );
  const browser = await chromium.launch({ executablePath: chromiumPath(), args: CHROMIUM_ARGS });
  // BENCH_PROFILE=<dir>: the server writes a V8 CPU profile there when it stops.
  const profile = process.env.BENCH_PROFILE ? ["--cpu-prof", `--cpu-prof-dir=${process.env.BENCH_PROFILE}`] : [];
  const server = await startServer(ROOT, { distDir: dist, nodeArgs: profile, tag: "bench" });
  const base = server.baseURL;
  try {
    await waitForHealth(server, 120_000);
    const page = await (
      await browser.newContext({ baseURL: base, viewport: { width: 1024, height: 768 }, hasTouch: true })
    ).newPage();
    await page.goto("/signin");
    await page.getByLabel("Email", { exact: true }).fill(tomasz.email);
    await page.getByLabel("Password", { exact: true }).fill(DEMO_PASSWORD);
    await page.getByRole("button", { name: "Sign in", exact: true }).click();
    await page.waitForURL((u) => u.pathname === "/");
    await page.getByRole("heading", { level: 2, name: "Wren" }).waitFor({ timeout: 60_000 });
    await page.goto("/cryostats/wren");
    if (process.env.BENCH_TXLOG) {
      // Every IndexedDB transaction the page opens from now on: when, which stores, how long.
      await page.evaluate(`(() => {
        const log = (window.__tx = []);
        const open = IDBDatabase.prototype.transaction;
        IDBDatabase.prototype.transaction = function (stores, mode, opts) {
          const tx = open.call(this, stores, mode, opts);
          const rec = { t0: performance.now(), stores: [].concat(stores).join(","), mode: mode || "readonly", end: null };
          log.push(rec);
          for (const ev of ["complete", "abort", "error"]) tx.addEventListener(ev, () => (rec.end = performance.now()));
          return tx;
        };
      })()`);
    }
    await page.getByRole("tab", { name: "Note" }).click();
    // Each tap: type a note, tap "Save note", wait for "saved". Back to back (a stress rate: the
    // store's live queries from one save still run when the next comes), then at a working pace
    // (one save every 1.5 s, so each save's sync round runs between taps, as on a real shift).
    const runTaps = async (runs: number, pauseMs: number) => {
      const times: { durable: number; shown: number }[] = [];
      for (let i = 0; i < runs; i++) {
        if (pauseMs) await page.waitForTimeout(pauseMs);
        await page.getByRole("textbox", { name: "Note", exact: true }).fill(`bench note ${i}`);
        const t = (await page.evaluate(`new Promise((resolve) => {
          const button = [...document.querySelectorAll("button")].find((b) => b.textContent === "Save note");
          performance.clearMarks("rimelog:entry-durable");
          const t0 = performance.now();
          // "saved" is drawn anew for each save, and only after the transaction committed.
          const obs = new MutationObserver((records) => {
            for (const r of records)
              for (const n of r.addedNodes)
                if (n.textContent && n.textContent.includes("saved on this tablet")) {
                  obs.disconnect();
                  const mark = performance.getEntriesByName("rimelog:entry-durable")[0];
                  const txs = (window.__tx || []).filter((x) => x.t0 > t0 - 300).map((x) => ({ at: x.t0 - t0, ms: x.end === null ? null : x.end - x.t0, mode: x.mode, stores: x.stores }));
                  resolve({ durable: mark ? mark.startTime - t0 : NaN, shown: performance.now() - t0, txs });
                  return;
                }
          });
          obs.observe(document.body, { subtree: true, childList: true });
          button.click();
        })`)) as { durable: number; shown: number };
        if (i >= 10) times.push(t); // the first few warm up the JIT and IndexedDB
        if (process.env.BENCH_TXLOG && t.durable > 30) {
          // A slow tap and the transactions around it (ms after the tap; a readwrite waits for
          // every earlier transaction on the same stores).
          console.log(`slow tap: ${t.durable.toFixed(1)} ms`);
          for (const x of (t as { txs?: { at: number; ms: number | null; mode: string; stores: string }[] }).txs ??
            []) {
            console.log(
              `  ${x.at.toFixed(1).padStart(7)} ms  ${x.ms === null ? "  open" : x.ms.toFixed(1).padStart(6)} ms  ${x.mode.padEnd(9)} ${x.stores}`,
            );
          }
        }
      }
      return times;
    };
    const pct = (xs: number[], p: number) => {
      const v = [...xs].sort((a, b) => a - b);
      return v[Math.min(v.length - 1, Math.floor(p * v.length))]!.toFixed(1);
    };
    const taps = process.env.BENCH_TAPS === undefined ? 120 : Number(process.env.BENCH_TAPS); // 0: the push only
    const pace = Number(process.env.BENCH_PACE_MS) || 1500;
    for (const [label, pause, runs] of [
      ["back to back", 0, taps],
      [`one save every ${pace / 1000} s`, pace, Math.ceil(taps / 2)],
    ] as const) {
      if (runs === 0) continue;
      const times = await runTaps(runs, pause);
      const durable = times.map((x) => x.durable);
      const shown = times.map((x) => x.shown);
      console.log(
        `tap → entry durable in IndexedDB (strict), ${label}, ${times.length} taps: p50 ${pct(durable, 0.5)} ms, p95 ${pct(durable, 0.95)} ms (goal p95 < 30 ms)`,
      );
      console.log(
        `tap → "saved" drawn on screen,           ${label}, ${times.length} taps: p50 ${pct(shown, 0.5)} ms, p95 ${pct(shown, 0.95)} ms`,
      );
    }

    // Push from the browser: N entries queued in the tablet store (written straight into
    // IndexedDB, as recordEntries would leave them), then one sync over HTTP until nothing is pending.
    await waitPendingZero(page);
    const since = await page.evaluate(() => document.querySelector('[data-testid="sync-indicator"]') !== null);
    if (!since) throw new Error("no sync indicator");
    // Plain JavaScript text: tsx would wrap named functions in a helper the page does not have.
    await page.evaluate(`(async (n) => {
      const db = await new Promise((res, rej) => { const o = indexedDB.open("rimelog"); o.onsuccess = () => res(o.result); o.onerror = () => rej(o.error); });
      const get = (key) => new Promise((res) => { const r = db.transaction("meta").objectStore("meta").get(key); r.onsuccess = () => res(r.result); });
      let session;
      for (let i = 0; i < 200 && !session; i++) {
        session = (await get("session"))?.value; // the first pull after sign-in writes it
        if (!session) await new Promise((r) => setTimeout(r, 100));
      }
      // Issued by the server when the sign-in registered the tablet (lib/sync/register.ts).
      const deviceId = (await get("deviceId"))?.value;
      if (!deviceId) throw new Error("the tablet holds no registration after sign-in");
      const tx = db.transaction(["entries", "outbox"], "readwrite", { durability: "strict" });
      const base = Date.now();
      for (let i = 0; i < n; i++) {
        const id = crypto.randomUUID();
        const entry = { id, cryostatId: i % 3 ? "heron" : "wren", runId: null, kind: "reading",
          payload: { quantity: "Temperature", stage: "still", value: 0.7 + (i % 50) / 1000, unit: "K" },
          authorId: session.user.id, deviceId, recordedAt: new Date(base + i).toISOString(), supersedes: null, reason: null };
        tx.objectStore("entries").add({ ...entry, sync: "pending", seq: null, hash: null, prevHash: null, receivedAt: null, rejection: null });
        tx.objectStore("outbox").add({ entryId: id, authorId: session.user.id, queuedAt: entry.recordedAt, bytes: JSON.stringify(entry).length, entry });
      }
      await new Promise((res, rej) => { tx.oncomplete = res; tx.onerror = () => rej(tx.error); });
      db.close();
    })(${N})`);
    const cursorBefore = await fetchCursor(page);
    const pushTimes: { start: number; end: number; sent: number; first: number; server: string }[] = [];
    page.on("requestfinished", async (r) => {
      if (!r.url().includes("/api/sync/push")) return;
      const { startTime, requestStart, responseStart, responseEnd } = r.timing();
      const server = (await r.response())?.headers()["server-timing"] ?? "";
      pushTimes.push({
        start: startTime,
        end: startTime + responseEnd,
        sent: requestStart,
        first: responseStart,
        server: server.replaceAll(";dur=", " ").replaceAll(",", ""),
      });
    });
    // Entries written behind Dexie's back are seen after a reload; offline, so none leaves early.
    const context = page.context();
    await context.setOffline(true);
    await page.reload();
    await page.waitForFunction(
      (n) => document.querySelector('[data-testid="sync-indicator"]')?.getAttribute("data-pending") === String(n),
      N,
      { timeout: 120_000 },
    );
    // CPU used meanwhile by the server and by each kind of the browser's processes (BENCH_DEBUG).
    const cpuOf = () => (process.env.BENCH_DEBUG ? cpuByProcess(process.pid) : new Map<string, number>());
    const cpu0 = cpuOf();
    // BENCH_PROFILE: the page's own CPU profile of the push, beside the server's.
    const cdp = process.env.BENCH_PROFILE ? await context.newCDPSession(page) : null;
    if (cdp) {
      await cdp.send("Profiler.enable");
      await cdp.send("Profiler.setSamplingInterval", { interval: 200 });
      await cdp.send("Profiler.start");
    }
    // BENCH_TRACE=<file>: a Chromium trace of the push (every process and thread), for chrome://tracing.
    if (process.env.BENCH_TRACE)
      await browser.startTracing(page, {
        path: process.env.BENCH_TRACE,
        categories: [
          "toplevel",
          "blink",
          "IndexedDB",
          "v8",
          "devtools.timeline",
          "disabled-by-default-devtools.timeline",
          "loading",
          "net",
          "mojom",
        ],
      });
    // Timed in the page: from its `online` event to the moment the indicator's pending count
    // becomes 0 in the document (a mutation observer, not polling).
    await page.evaluate(`(window.__push = new Promise((resolve) => {
      let onlineAt = null;
      addEventListener("online", () => { onlineAt = performance.now(); }, { once: true });
      const obs = new MutationObserver(() => {
        if (onlineAt !== null && document.querySelector('[data-testid="sync-indicator"]')?.getAttribute("data-pending") === "0") {
          obs.disconnect();
          resolve(performance.now() - onlineAt);
        }
      });
      obs.observe(document.body, { subtree: true, childList: true, attributes: true, attributeFilter: ["data-pending"] });
    }), 0)`);
    const monotonic0 = process.hrtime.bigint();
    const t0 = Date.now();
    await context.setOffline(false); // the `online` event starts the sync
    const pushMs = (await page.evaluate("window.__push")) as number;
    const benchSideMs = Date.now() - t0;
    if (process.env.BENCH_PROFILE) {
      // The push's window on the monotonic clock (the server's CPU profile uses the same clock, µs).
      console.log(`push window (monotonic µs): ${monotonic0 / 1000n} … ${process.hrtime.bigint() / 1000n}`);
    }
    const cpu1 = cpuOf();
    if (process.env.BENCH_TRACE) await browser.stopTracing();
    if (cdp) {
      const { profile: pageProfile } = await cdp.send("Profiler.stop");
      writeFileSync(join(process.env.BENCH_PROFILE!, "page-push.cpuprofile"), JSON.stringify(pageProfile));
    }
    // Then the tablet writes the answers into its entries (the receipts), off the push's path.
    const receiptsLeft = `new Promise((resolve) => {
      const o = indexedDB.open("rimelog");
      o.onsuccess = () => {
        const r = o.result.transaction("receipts").objectStore("receipts").count();
        r.onsuccess = () => { o.result.close(); resolve(r.result); };
      };
    })`;
    while ((await page.evaluate(receiptsLeft)) !== 0) await new Promise((r) => setTimeout(r, 50));
    const foldMs = Date.now() - t0;
    if (process.env.BENCH_DEBUG) {
      // When each request left and its answer arrived, in ms after "online": the gaps between are the tablet's own work.
      console.log(`pushes: ${pushTimes.length}; ms after online, sent → answered (server's own ms):`);
      for (const x of pushTimes)
        console.log(
          `  ${(x.start - t0).toFixed(0)} → ${(x.end - t0).toFixed(0)}  (request sent by ${x.sent.toFixed(0)}, first byte of the answer at ${x.first.toFixed(0)}; ${x.server})`,
        );
      const used = [...cpu1].map(([what, s]) => `${what} ${(s - (cpu0.get(what) ?? 0)).toFixed(2)} s`);
      console.log(`CPU used during the push, by process: ${used.join(", ")}`);
    }
    // The same rows as the server stored them, inserted raw into a fresh database here.
    const rows = [];
    for (let since = cursorBefore; ; ) {
      const r = await page.request.get(`/api/sync/pull?since=${since}`);
      const body = (await r.json()) as { entries: Record<string, unknown>[]; cursor: number; hasMore: boolean };
      rows.push(...body.entries);
      since = body.cursor;
      if (!body.hasMore) break;
    }
    const values = rows.map((e) => ({
      ...(e as EntryRowIn),
      recordedAt: new Date(e.recordedAt as string),
      receivedAt: new Date(e.receivedAt as string),
    }));

    // The server's share over HTTP: the same kind of push sent from here (no browser work beside
    // it), batch by batch as the tablet sends them, with the tablet page closed.
    const deviceId = (rows[0] as { deviceId: string }).deviceId;
    await page.goto("about:blank");
    await new Promise((r) => setTimeout(r, 1000));
    const drafts = Array.from({ length: N }, (_, i) =>
      entryInput(
        {
          cryostatId: i % 3 ? "heron" : "wren",
          kind: "reading",
          payload: { quantity: "Temperature", stage: "still", value: 0.7 + (i % 50) / 1000, unit: "K" },
          authorId: tomasz.id,
          deviceId,
        },
        new Date(Date.now() + i),
      ),
    );
    const sizes = [
      200,
      ...Array.from({ length: Math.ceil((N - 200) / PUSH_LIMITS.maxEntries) }, () => PUSH_LIMITS.maxEntries),
    ];
    let serverOwn = 0;
    const tHttp = performance.now();
    for (let at = 0, k = 0; at < drafts.length; at += sizes[k]!, k++) {
      const res = await page.request.post("/api/sync/push", {
        data: { entries: drafts.slice(at, at + sizes[k]!) },
        headers: { origin: base },
      });
      if (!res.ok()) throw new Error(`push from node: ${res.status()} ${await res.text()}`);
      serverOwn += Number(/apply;dur=([\d.]+)/.exec(res.headers()["server-timing"] ?? "")?.[1] ?? NaN);
    }
    const httpMs = performance.now() - tHttp;

    // The baselines run on a quiet machine: the browser and the server are stopped first.
    await browser.close();
    await stopServer(server);
    const raw = await rawInserts(values);
    report(
      `browser push of ${N} queued entries over HTTP (Chromium IndexedDB → /api/sync/push → PGlite), "online" to nothing pending`,
      pushMs,
      raw,
      values.length,
    );
    console.log(`  (seen from the bench, from setting the browser online to the page's answer: ${ms(benchSideMs)})`);
    console.log(
      `  … and every answer written into the tablet's entries (receipts folded) ${ms(foldMs)} after "online"`,
    );
    report(
      `the same push sent from Node over HTTP (no browser beside the server), batch after batch`,
      httpMs,
      raw,
      values.length,
    );
    console.log(`  … of which the server's own apply (Server-Timing): ${ms(serverOwn)}`);
  } finally {
    await browser.close();
    await stopServer(server);
    server.dirs.remove();
  }
}

const what = process.argv[2] ?? "all";
if (what === "push" || what === "all") await benchPush();
if (what === "tap" || what === "all") await benchTap();
