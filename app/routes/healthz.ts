// A bare health check for scripts and load balancers: answers when the app and its database do.
import { sql } from "drizzle-orm";
import { db } from "~/db/client.server";

export async function loader() {
  try {
    await db.execute(sql`select 1`);
    return Response.json({ ok: true });
  } catch {
    return Response.json({ ok: false, problem: "database unreachable" }, { status: 503 });
  }
}
