// The password rule for new and changed passwords: 10 to 200 characters, and not common or
// trivial as judged by zxcvbn-ts (@zxcvbn-ts/core with the common and English dictionaries, all in
// the package, no network): its score must be at least 3 of 4 ("safely unguessable: moderate
// protection from offline slow-hash scenario"), with the person's name and email and the app's own
// words counted as guessable. The message says what to do, with zxcvbn's warning when it has one.
import "server-only";

export const MIN_PASSWORD_LENGTH = 10;
export const MAX_PASSWORD_LENGTH = 200;
export const MIN_SCORE = 3;

type Estimate = { score: number; warning: string | null };
type Estimator = { name: "zxcvbn-ts" | "fallback"; estimate: (password: string, inputs: string[]) => Estimate };

// The packages are loaded by name at run time (webpackIgnore: Node resolves them from
// node_modules), so that a checkout whose node_modules predates them still builds and runs.
const load = (name: string): Promise<Record<string, unknown>> => import(/* webpackIgnore: true */ name);

type ZxcvbnResult = { score: number; feedback: { warning?: string | null } };
type LanguagePack = { dictionary?: Record<string, unknown>; adjacencyGraphs?: unknown; translations?: unknown };

async function zxcvbnEstimator(): Promise<Estimator> {
  const [core, common, en] = await Promise.all([
    load("@zxcvbn-ts/core"),
    load("@zxcvbn-ts/language-common"),
    load("@zxcvbn-ts/language-en"),
  ]);
  const pack = (m: Record<string, unknown>) => ((m.default as LanguagePack | undefined) ?? m) as LanguagePack;
  const options = {
    translations: pack(en).translations,
    graphs: pack(common).adjacencyGraphs,
    dictionary: { ...pack(common).dictionary, ...pack(en).dictionary },
  };
  // Version 4 has a factory; version 3 a module-wide options object.
  const Factory = core.ZxcvbnFactory as
    | (new (
        o: unknown,
      ) => { check(p: string, u: string[]): ZxcvbnResult })
    | undefined;
  let check: (p: string, u: string[]) => ZxcvbnResult;
  if (Factory) {
    const z = new Factory(options);
    check = (p, u) => z.check(p, u);
  } else {
    (core.zxcvbnOptions as { setOptions(o: unknown): void }).setOptions(options);
    check = core.zxcvbn as (p: string, u: string[]) => ZxcvbnResult;
  }
  return {
    name: "zxcvbn-ts",
    estimate: (p, u) => {
      const r = check(p, u);
      return { score: r.score, warning: r.feedback.warning || null };
    },
  };
}

/**
 * TEMPORARY FALLBACK, used only while @zxcvbn-ts/* are not installed in node_modules (they are in
 * package.json): a few trivial patterns and a short list of the most common passwords. It is far
 * weaker than zxcvbn and logs a warning when it is used. Remove once the packages are installed.
 */
const FALLBACK_COMMON = [
  "password",
  "passw0rd",
  "qwerty",
  "azerty",
  "letmein",
  "welcome",
  "iloveyou",
  "admin",
  "abc123",
  "monkey",
  "dragon",
  "football",
  "baseball",
  "sunshine",
  "princess",
  "changeme",
  "secret",
];
function fallbackEstimator(): Estimator {
  return {
    name: "fallback",
    estimate: (password, inputs) => {
      const p = password.toLowerCase();
      const core = p.replace(/[^a-z]/g, "");
      const distinct = new Set(p).size;
      const sequential = [..."0123456789", ..."abcdefghijklmnopqrstuvwxyz"].join("");
      if (distinct < 5 || sequential.includes(p) || /^(.+?)\1+$/.test(p))
        return { score: 0, warning: "This is a repeated or sequential pattern." };
      if (FALLBACK_COMMON.some((w) => core.startsWith(w) || core.endsWith(w)))
        return { score: 0, warning: "This is a commonly used password." };
      if (inputs.some((w) => w.length >= 3 && p.includes(w.toLowerCase())))
        return { score: 1, warning: "It contains your name, your email address or the app's name." };
      return { score: MIN_SCORE, warning: null };
    },
  };
}

let estimator: Promise<Estimator> | undefined;
export function passwordEstimator(): Promise<Estimator> {
  estimator ??= zxcvbnEstimator().catch((e: unknown) => {
    console.warn(
      `[rimelog] password policy: @zxcvbn-ts not installed (${(e as Error).message}); using the temporary fallback`,
    );
    return fallbackEstimator();
  });
  return estimator;
}

/** What is wrong with this password for this person, in plain words, or null when it may be used. */
export async function passwordProblem(
  password: string,
  person: { email?: string | undefined; name?: string | undefined } = {},
): Promise<string | null> {
  if (password.length < MIN_PASSWORD_LENGTH) return `Use at least ${MIN_PASSWORD_LENGTH} characters.`;
  if (password.length > MAX_PASSWORD_LENGTH) return `Use at most ${MAX_PASSWORD_LENGTH} characters.`;
  const inputs = [
    ...(person.name ?? "").split(/\s+/),
    ...(person.email ?? "").split(/[@.]/),
    "rimelog",
    "cryostat",
    "logbook",
  ].filter((w) => w.length >= 3);
  const { estimate } = await passwordEstimator();
  const { score, warning } = estimate(password, inputs);
  if (score >= MIN_SCORE) return null;
  return `This password is too easy to guess${warning ? ` (${warning.replace(/\.$/, "").toLowerCase()})` : ""}. Use a few unrelated words or a longer phrase.`;
}
