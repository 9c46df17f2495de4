// Prices (invented for the demo), in cents. One seat is one student for one school year.
export const SCHOOL_SEAT_PRICE_CENTS = 900;
export const FAMILY_SEAT_PRICE_CENTS = 1400;

// Making an Intl.NumberFormat costs far more than using one (the landing page shows several prices).
const priceFormats = new Map<string, Intl.NumberFormat>();

export function formatPrice(cents: number, currency = "usd"): string {
  const code = currency.toUpperCase();
  let format = priceFormats.get(code);
  if (!format) {
    format = new Intl.NumberFormat("en-US", { style: "currency", currency: code });
    priceFormats.set(code, format);
  }
  return format.format(cents / 100);
}
