// The shapes of ids in addresses and query strings, shared by every route's schema so a malformed
// id answers 400 before it reaches the database. Users and cryostats have readable ids
// ("u-ines", a cryostat's slug); entries, runs, attachments and templates have UUIDs.
import { z } from "zod";

/** A readable id: letters, digits, "-", "_", ".", ":"; at most 100 characters. */
export const idParam = z
  .string()
  .min(1, "Enter an id.")
  .max(100, "This id is too long.")
  .regex(/^[A-Za-z0-9][A-Za-z0-9._:-]*$/, "This is not an id.");

export const uuidParam = z.uuid("This is not a record id.");
