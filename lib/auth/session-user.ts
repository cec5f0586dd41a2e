// The signed-in user as the server sees it on each request.
import type { Role } from "@/db/schema";

export type SessionUser = { id: string; email: string; name: string; role: Role };
