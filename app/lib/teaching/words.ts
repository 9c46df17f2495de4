// Teacher-facing words for what the answer checker decided. Our own wording; safe in the browser.

const SLIP_WORDS: Record<string, string> = {
  "loaded-reading-as-deformation": "Gave the loaded ruler reading instead of the deformation",
  "total-length-as-change": "Gave a whole length instead of the change in length",
  "multiplied-not-divided": "Multiplied force by deformation instead of dividing",
  "ratio-upside-down": "Turned the ratio upside down",
  "unit-factor-10": "Off by a factor of 10 (a unit slip)",
  "unit-factor-100": "Off by a factor of 100 (a unit slip)",
  "unit-factor-1000": "Off by a factor of 1000 (a unit slip)",
  "mass-not-weight": "Gave a mass instead of a weight in newtons",
};

const OUTCOME_WORDS: Record<string, string> = {
  correct: "Right",
  "unit-missing": "Right number, but no unit",
  "unit-wrong-kind": "A unit of another quantity",
  "sig-figs-off": "Right value, other significant figures than asked",
  incorrect: "Wrong, with no slip we recognise",
  unreadable: "Could not be read (no try used)",
  "not-checkable": "Not checkable (no try used)",
};

/** The group a wrong answer falls in: its named slip, or else what the checker decided. */
export function wrongAnswerGroup(slipCode: string | null, outcome: string): { key: string; label: string } {
  if (slipCode) return { key: `slip:${slipCode}`, label: SLIP_WORDS[slipCode] ?? `Slip “${slipCode}”` };
  return { key: `outcome:${outcome}`, label: OUTCOME_WORDS[outcome] ?? outcome };
}

export function outcomeWords(outcome: string): string {
  return OUTCOME_WORDS[outcome] ?? outcome;
}

/** What the student typed, readable: tables and choices are stored as JSON. */
export function readableAnswer(raw: string): string {
  try {
    const value = JSON.parse(raw) as unknown;
    if (Array.isArray(value)) return value.map((c) => String(c || "—")).join(" | ");
    if (value && typeof value === "object" && "choice" in value) {
      const { choice, reason } = value as { choice: unknown; reason?: unknown };
      return reason ? `${String(choice)} — “${String(reason)}”` : String(choice);
    }
  } catch {
    // Plain text answers are not JSON.
  }
  return raw;
}
