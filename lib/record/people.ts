// Who may be listed as present at a transfer (a transfer record's `peoplePresent`, a procedure
// step's `secondPersonId`): a known, active user of the facility, by id; or a visitor, marked as
// one and named ("visitor:Jane Roe"), whom the auditor sees flagged. The wire format stays a list
// of strings. Pure: the tablet runs it before saving (it guides), the server before storing (it
// decides, db/queries/people-check.ts).

/** The mark that makes a listed person a visitor: `visitor:` followed by the visitor's name. */
export const VISITOR_PREFIX = "visitor:";
/** Longest visitor name (the entry in a list also carries the prefix). */
export const VISITOR_NAME_MAX = 50;

export type ListedPerson = { kind: "user"; id: string } | { kind: "visitor"; name: string };

/** What the rule needs to know of the facility's people. */
export type KnownPerson = { id: string; active: boolean };

export type PeopleProblem = { code: "bad_request:people"; message: string };

/** The list entry for a visitor of this name (spaces tidied). */
export function visitorEntry(name: string): string {
  return `${VISITOR_PREFIX}${tidy(name)}`;
}

/** Read one list entry: a visitor when it carries the mark, else a user's id. */
export function parseListedPerson(entry: string): ListedPerson {
  return entry.startsWith(VISITOR_PREFIX)
    ? { kind: "visitor", name: tidy(entry.slice(VISITOR_PREFIX.length)) }
    : { kind: "user", id: entry };
}

export function isVisitor(entry: string): boolean {
  return entry.startsWith(VISITOR_PREFIX);
}

/** How a list entry reads on screen: a user's name (from `names`), or "Jane Roe (visitor)". */
export function personLabel(entry: string, names: Record<string, string> | Map<string, string>): string {
  const p = parseListedPerson(entry);
  if (p.kind === "visitor") return `${p.name} (visitor)`;
  return (names instanceof Map ? names.get(p.id) : names[p.id]) ?? p.id;
}

function tidy(name: string): string {
  return name.trim().replace(/\s+/g, " ");
}

/** One listed person against the facility's people; null when the entry may be listed. */
export function personProblem(entry: string, known: readonly KnownPerson[]): string | null {
  const p = parseListedPerson(entry);
  if (p.kind === "visitor") {
    if (!p.name) return `"${entry}" marks a visitor but gives no name: write the visitor's name after "visitor:".`;
    if (p.name.length > VISITOR_NAME_MAX) return `A visitor's name has at most ${VISITOR_NAME_MAX} characters.`;
    if (entry !== visitorEntry(p.name)) return `Write a visitor as "${visitorEntry(p.name)}" (spaces tidied).`;
    return null;
  }
  const user = known.find((u) => u.id === p.id);
  if (!user)
    return `"${p.id}" is not a user of this facility. Choose a person from the list, or add them as a visitor with their name.`;
  if (!user.active)
    return `"${p.id}" no longer has access to this facility; a former user can only be listed as a visitor.`;
  return null;
}

/**
 * The rule for a list of people present: each a known active user or a named visitor, nobody
 * listed twice (a visitor's name compared without regard to case). Returns the problems, none
 * when the list may be stored.
 */
export function peopleProblems(list: readonly string[], known: readonly KnownPerson[]): string[] {
  const problems: string[] = [];
  const seen = new Set<string>();
  for (const entry of list) {
    const problem = personProblem(entry, known);
    if (problem) {
      problems.push(problem);
      continue;
    }
    const p = parseListedPerson(entry);
    const key = p.kind === "visitor" ? `v:${p.name.toLowerCase()}` : `u:${p.id}`;
    if (seen.has(key)) problems.push(`${p.kind === "visitor" ? p.name : p.id} is listed twice.`);
    seen.add(key);
  }
  return problems;
}

/**
 * The rule for a procedure step's second person: someone other than the one recording, and a
 * known active user or a named visitor.
 */
export function secondPersonProblem(entry: string, authorId: string, known: readonly KnownPerson[]): string | null {
  if (entry === authorId) return "The second person must be someone other than the one recording the step.";
  return personProblem(entry, known);
}

/** The visitors in a list, by name. */
export function visitorsIn(list: readonly string[]): string[] {
  return list.map(parseListedPerson).flatMap((p) => (p.kind === "visitor" && p.name ? [p.name] : []));
}
