// Prices (invented for the demo), in cents. One seat is one student for one school year.
export const SCHOOL_SEAT_PRICE_CENTS = 900;
export const FAMILY_SEAT_PRICE_CENTS = 1400;

export function formatPrice(cents: number, currency = "usd"): string {
  return new Intl.NumberFormat("en-US", { style: "currency", currency: currency.toUpperCase() }).format(cents / 100);
}
