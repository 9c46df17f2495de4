// A student's written claim–evidence–reasoning answer, as teachers and parents read it.
export function ClaimEvidenceReasoning({ answer }: { answer: { claim: string; evidence: string; reasoning: string } }) {
  return (
    <dl className="grid gap-1 sm:grid-cols-[8rem_1fr]">
      <dt className="font-bold">Claim</dt>
      <dd className="whitespace-pre-wrap wrap-anywhere">{answer.claim || "—"}</dd>
      <dt className="font-bold">Evidence</dt>
      <dd className="whitespace-pre-wrap wrap-anywhere">{answer.evidence || "—"}</dd>
      <dt className="font-bold">Reasoning</dt>
      <dd className="whitespace-pre-wrap wrap-anywhere">{answer.reasoning || "—"}</dd>
    </dl>
  );
}
