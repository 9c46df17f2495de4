// The app's payment modules for the webhook tests, imported only after PAYMENTS_API_URL points at the
// payments fake: the app's SDK client reads the address when its module is first loaded.

/** Points the app at the fake at `fakeUrl`, then loads the modules the tests call, and the app's SDK client. */
export async function appPaymentModules(fakeUrl: string) {
  process.env.PAYMENTS_API_URL = fakeUrl;
  const modules = {
    db: (await import("~/db/client.server")).db,
    webhook: await import("~/routes/api.payments.webhook"),
    purchases: await import("~/lib/purchases.server"),
    seats: await import("~/lib/seats.server"),
    receipts: await import("~/lib/receipts.server"),
  };
  return { modules, stripe: (await import("~/lib/payments.server")).payments() };
}

export type PaymentModules = Awaited<ReturnType<typeof appPaymentModules>>["modules"];
