// Who may be listed present, held by the server (the rule is lib/record/people.ts): a transfer's
// people present and a procedure step's second person are each a known, active user of the
// facility, or a visitor marked as one with a name. An entry naming anyone else is refused alone.
import type { Db } from "@/db/client";
import { users } from "@/db/schema";
import { peopleProblems, secondPersonProblem } from "@/lib/record/people";
import type { EntryInput } from "@/lib/schemas/entry";
import type { LogCheck, Problem } from "./log-check";

async function facilityPeople(db: Db) {
  return db.select({ id: users.id, active: users.active }).from(users);
}

const refused = (problems: string[]): Problem => ({
  code: "bad_request:people",
  message: `${problems.join(" ")} Nothing was stored for this entry.`,
});

function namesSomeone(e: EntryInput): boolean {
  if (e.kind === "transfer") return true;
  return e.kind === "run.step" && e.payload.kind === "check" && e.payload.secondPersonId !== undefined;
}

export const peopleChecks: LogCheck[] = [
  {
    when: namesSomeone,
    check: async (db, e) => {
      const known = await facilityPeople(db);
      if (e.kind === "transfer") {
        const problems = peopleProblems(e.payload.peoplePresent, known);
        return problems.length ? refused(problems) : null;
      }
      if (e.kind === "run.step" && e.payload.kind === "check" && e.payload.secondPersonId !== undefined) {
        const problem = secondPersonProblem(e.payload.secondPersonId, e.authorId, known);
        return problem ? refused([problem]) : null;
      }
      return null;
    },
  },
];
