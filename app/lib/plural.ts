// A count with its noun: "1 seat", "3 seats", "1 question waits", "2 questions wait".

/** `n` and `one` or `many` (by default `one` with an s). */
export const plural = (n: number, one: string, many = `${one}s`) => `${n} ${n === 1 ? one : many}`;
