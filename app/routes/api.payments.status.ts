// GET /api/payments/status?purchase=<id> — where a purchase stands, for the return page to poll while
// it waits for the payment service's signed event. Reading only: nothing is ever granted from here.
import { z } from "zod";
import type { Route } from "./+types/api.payments.status";
import { db } from "~/db/client.server";
import { getUser } from "~/lib/auth.server";
import { buyerOrganisationIds, purchaseIn } from "~/lib/purchases.server";
import { seatLedgerForYear } from "~/lib/seats.server";

const query = z.object({ purchase: z.uuid() });
const noStore = { "Cache-Control": "no-store" };

export async function loader({ request }: Route.LoaderArgs) {
  const user = await getUser(request);
  if (!user) return Response.json({ error: "Sign in to see your purchases." }, { status: 401, headers: noStore });
  const parsed = query.safeParse(Object.fromEntries(new URL(request.url).searchParams));
  const purchase = parsed.success ? await purchaseIn({ db }, parsed.data.purchase, buyerOrganisationIds(user)) : null;
  if (!purchase) return Response.json({ error: "There is no such purchase among yours." }, { status: 404, headers: noStore });
  const ledger = await seatLedgerForYear({ db }, purchase.organisationId, purchase.schoolYear);
  return Response.json(
    { status: purchase.status, seats: purchase.seats, schoolYear: purchase.schoolYear, ledger },
    { headers: noStore },
  );
}
