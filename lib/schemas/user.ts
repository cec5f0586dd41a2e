// Adding a person (facility admin form and the server's parse).
import { z } from "zod";

export const newUserSchema = z.object({
  name: z.string().trim().min(2, "Enter the person's full name").max(120),
  email: z.string().trim().toLowerCase().email("Enter a valid email address").max(200),
  role: z.enum(["technician", "researcher", "safety_officer", "facility_admin"], { message: "Choose a role" }),
  password: z.string().min(10, "At least 10 characters").max(200),
});
export type NewUser = z.infer<typeof newUserSchema>;
