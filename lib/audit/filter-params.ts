// The audit table's filters as URL query parameters, parsed once for the table, the CSV and the PDF.
import { z } from "zod";
import { AppError } from "@/lib/errors";
import { formatIssues } from "@/lib/schemas/entry";
import { FLAG_CODES } from "./flags";

/** A date or date-time within years 1900–9999 (the database refuses year 0; nothing was recorded before 1900). */
const recordDate = z
  .union([z.iso.datetime(), z.iso.date()])
  .refine((v) => Number(v.slice(0, 4)) >= 1900, "Enter a date from 1900 on.");

export const auditFilterSchema = z.object({
  cryostat: z.string().max(60).optional(),
  person: z.string().max(60).optional(),
  from: recordDate.optional(),
  to: recordDate.optional(),
  flag: z.enum(FLAG_CODES).optional(),
  kinds: z
    .string()
    .regex(/^(transfer|quench|incident)(,(transfer|quench|incident))*$/)
    .optional(),
  sort: z.enum(["date", "cryostat", "efficiency", "flags"]).optional(),
  dir: z.enum(["asc", "desc"]).optional(),
});
export type AuditFilterParams = z.infer<typeof auditFilterSchema>;

/** A date-only `to` means the end of that day (UTC). */
export function toFilter(p: AuditFilterParams) {
  const to = p.to && /^\d{4}-\d{2}-\d{2}$/.test(p.to) ? `${p.to}T23:59:59.999Z` : p.to;
  const from = p.from && /^\d{4}-\d{2}-\d{2}$/.test(p.from) ? `${p.from}T00:00:00.000Z` : p.from;
  return {
    cryostatId: p.cryostat || undefined,
    personId: p.person || undefined,
    from,
    to,
    flag: p.flag,
    kinds: p.kinds ? (p.kinds.split(",") as ("transfer" | "quench" | "incident")[]) : undefined,
    sort: p.sort,
    dir: p.dir,
  };
}

export function parseSearch(url: string) {
  const params = Object.fromEntries([...new URL(url).searchParams.entries()].filter(([, v]) => v !== ""));
  return auditFilterSchema.safeParse(params);
}

/** The filter of a request's URL, or a 400 naming what is wrong (`message` says what to check). */
export function filterFromUrl(url: string, surface: string, message = "Check the filters.") {
  const p = parseSearch(url);
  if (!p.success) throw new AppError("bad_request", surface, message, formatIssues(p.error));
  return toFilter(p.data);
}
