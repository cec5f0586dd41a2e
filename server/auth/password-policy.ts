// The password rule for new and changed passwords: 10 to 200 characters, and not common or
// trivial as judged by zxcvbn-ts (@zxcvbn-ts/core with the common and English dictionaries, all in
// the package, no network): its score must be at least 3 of 4 ("safely unguessable: moderate
// protection from offline slow-hash scenario"), with the person's name and email and the app's own
// words counted as guessable. The message says what to do, with zxcvbn's warning when it has one.
import "server-only";
import { ZxcvbnFactory } from "@zxcvbn-ts/core";
import * as common from "@zxcvbn-ts/language-common";
import * as en from "@zxcvbn-ts/language-en";

export const MIN_PASSWORD_LENGTH = 10;
export const MAX_PASSWORD_LENGTH = 200;
export const MIN_SCORE = 3;

type Estimate = { score: number; warning: string | null };

let checker: ZxcvbnFactory | undefined;
function estimate(password: string, inputs: string[]): Estimate {
  checker ??= new ZxcvbnFactory({
    translations: en.translations,
    graphs: common.adjacencyGraphs,
    dictionary: { ...common.dictionary, ...en.dictionary },
  });
  const r = checker.check(password, inputs);
  return { score: r.score, warning: r.feedback.warning || null };
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
  const { score, warning } = estimate(password, inputs);
  if (score >= MIN_SCORE) return null;
  return `This password is too easy to guess${warning ? ` (${warning.replace(/\.$/, "").toLowerCase()})` : ""}. Use a few unrelated words or a longer phrase.`;
}
