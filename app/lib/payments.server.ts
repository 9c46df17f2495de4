// The payment provider's SDK, pointed by configuration at our local fake or at the real service.
import Stripe from "stripe";
import { serverEnv } from "~/env.server";

let client: Stripe | undefined;

export function payments(): Stripe {
  if (client) return client;
  const env = serverEnv();
  const api = new URL(env.PAYMENTS_API_URL);
  client = new Stripe(env.PAYMENTS_SECRET_KEY, {
    host: api.hostname,
    port: api.port || (api.protocol === "https:" ? 443 : 80),
    protocol: api.protocol === "https:" ? "https" : "http",
    telemetry: false,
    maxNetworkRetries: 1,
  });
  return client;
}
