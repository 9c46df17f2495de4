// The provider's published test card numbers and what each one does. Any other number is refused,
// so no real card can ever be typed into the fake by mistake and "work".

export type CardOutcome =
  | { ok: true; brand: string; last4: string }
  | { ok: false; code: "card_declined" | "insufficient_funds" | "expired_card" | "invalid_number" | "incomplete"; message: string };

const published: Record<string, CardOutcome> = {
  "4242424242424242": { ok: true, brand: "visa", last4: "4242" },
  "4000000000000002": { ok: false, code: "card_declined", message: "The card was declined. No money was taken. Try another card." },
  "4000000000009995": { ok: false, code: "insufficient_funds", message: "The card has insufficient funds. No money was taken. Try another card." },
  "4000000000000069": { ok: false, code: "expired_card", message: "The card has expired. No money was taken. Try another card." },
};

export interface CardForm {
  number: string;
  expiry: string;
  cvc: string;
}

/** Checks the form as a card page would (complete, plausible), then answers as the test card says. */
export function chargeTestCard(form: CardForm, today = new Date()): CardOutcome {
  const digits = form.number.replace(/[\s-]/g, "");
  if (!/^\d{12,19}$/.test(digits)) {
    return { ok: false, code: "incomplete", message: "Enter the card number: 16 digits, spaces allowed." };
  }
  const expiry = form.expiry.replace(/\s/g, "").match(/^(\d{2})\/?(\d{2})$/);
  if (!expiry || Number(expiry[1]) < 1 || Number(expiry[1]) > 12) {
    return { ok: false, code: "incomplete", message: "Enter the expiry date as MM/YY, for example 12/34." };
  }
  const expiryYear = 2000 + Number(expiry[2]);
  const expiryMonth = Number(expiry[1]);
  if (expiryYear < today.getUTCFullYear() || (expiryYear === today.getUTCFullYear() && expiryMonth < today.getUTCMonth() + 1)) {
    return { ok: false, code: "incomplete", message: "That expiry date is in the past. Use a date in the future for test cards." };
  }
  if (!/^\d{3,4}$/.test(form.cvc.trim())) {
    return { ok: false, code: "incomplete", message: "Enter the 3-digit security code from the back of the card." };
  }
  return (
    published[digits] ?? {
      ok: false,
      code: "invalid_number",
      message: "Only the published test card numbers work here, for example 4242 4242 4242 4242.",
    }
  );
}
