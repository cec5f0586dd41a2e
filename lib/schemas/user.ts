// People and roles: the four roles of the room, the signed-in user as tablet and server see it,
// and adding a person (facility admin form and the server's parse).
import { z } from "zod";

export const ROLES = ["technician", "researcher", "safety_officer", "facility_admin"] as const;
export type Role = (typeof ROLES)[number];

/** The signed-in user as the server sees it on each request, and as the tablet keeps it. */
export type SessionUser = { id: string; email: string; name: string; role: Role };

export const newUserSchema = z.object({
  name: z.string().trim().min(2, "Enter the person's full name").max(120),
  email: z.string().trim().toLowerCase().email("Enter a valid email address").max(200),
  role: z.enum(ROLES, { message: "Choose a role" }),
  password: z.string().min(10, "At least 10 characters").max(200),
});
export type NewUser = z.infer<typeof newUserSchema>;

/** A person as other screens see them. */
export type PublicUser = { id: string; name: string; role: Role; active: boolean };
/** A person as the facility admin sees them (createdAt is a Date on the server, a string over JSON). */
export type AdminUser = PublicUser & { email: string; createdAt: Date | string };
