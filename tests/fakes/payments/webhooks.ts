// Events and their delivery, the way the provider does it: each event is one JSON body, signed afresh
// for every attempt with the SDK's own test-header helper, retried with growing pauses until the
// webhook address answers 2xx, and re-sendable later by the operator (or a test).
import Stripe from "stripe";
import { FAKE_API_VERSION, newId, unixNow, type EventRecord, type FakeEvent, type FakeState, type Json } from "./store";

/** How a signed event reaches the app; the default posts it over HTTP. Answers the HTTP status (0 = unreachable). */
export type WebhookTransport = (request: { url: string; body: string; headers: Record<string, string> }) => Promise<number>;

export interface WebhookOptions {
  webhookUrl?: string;
  webhookSecret: string;
  /** Pauses before each retry; the provider's own schedule stretches over days, ours over minutes. */
  retryDelaysMs: number[];
  transport?: WebhookTransport;
  /** How long one delivery may take before it counts as failed. */
  timeoutMs?: number;
}

export const DEFAULT_RETRY_DELAYS_MS = [1_000, 4_000, 16_000, 64_000, 256_000];

const httpTransport =
  (timeoutMs: number): WebhookTransport =>
  async ({ url, body, headers }) => {
    const response = await fetch(url, { method: "POST", headers, body, signal: AbortSignal.timeout(timeoutMs) });
    await response.arrayBuffer().catch(() => undefined);
    return response.status;
  };

export class WebhookSender {
  private readonly signer = new Stripe("sk_test_fake_signer", { telemetry: false });
  private readonly timers = new Set<NodeJS.Timeout>();
  private readonly inFlight = new Set<Promise<unknown>>();
  private stopped = false;

  constructor(
    private readonly state: FakeState,
    private readonly options: WebhookOptions,
  ) {}

  /** Records an event about `object` and starts delivering it. */
  emit(type: string, object: Json, previousAttributes?: Json, requestId: string | null = null): FakeEvent {
    const event: FakeEvent = {
      id: newId("evt"),
      object: "event",
      api_version: FAKE_API_VERSION,
      created: unixNow(),
      data: previousAttributes ? { object: structuredClone(object), previous_attributes: previousAttributes } : { object: structuredClone(object) },
      livemode: false,
      pending_webhooks: this.options.webhookUrl || this.options.transport ? 1 : 0,
      request: { id: requestId, idempotency_key: null },
      type,
    };
    const record: EventRecord = { event, payload: JSON.stringify(event, null, 2), deliveries: [], delivered: false, gaveUp: false };
    this.state.events.push(record);
    if (event.pending_webhooks > 0) this.track(this.attempt(record, 0));
    return event;
  }

  /** Sends an event again now (the operator's "send again"); answers the HTTP status. */
  async resend(eventId: string): Promise<number> {
    const record = this.state.events.find((r) => r.event.id === eventId);
    if (!record) throw new Error(`No such event: ${eventId}`);
    const promise = this.send(record);
    this.track(promise);
    return promise;
  }

  /** Resolves once no delivery is under way or waiting for a retry. */
  async settled(): Promise<void> {
    while (this.inFlight.size > 0 || this.timers.size > 0) {
      await Promise.allSettled([...this.inFlight]);
      if (this.timers.size > 0) await new Promise((r) => setTimeout(r, 10));
    }
  }

  stop() {
    this.stopped = true;
    for (const timer of this.timers) clearTimeout(timer);
    this.timers.clear();
  }

  /** Signs a body exactly as the provider does: `t=<unix time>,v1=<HMAC-SHA256>`. */
  sign(payload: string): string {
    return this.signer.webhooks.generateTestHeaderString({ payload, secret: this.options.webhookSecret });
  }

  private track(promise: Promise<unknown>) {
    this.inFlight.add(promise);
    void promise.finally(() => this.inFlight.delete(promise));
  }

  private async attempt(record: EventRecord, retryIndex: number): Promise<void> {
    const status = await this.send(record);
    if (status >= 200 && status < 300) return;
    const delay = this.options.retryDelaysMs[retryIndex];
    if (delay === undefined || this.stopped) {
      record.gaveUp = true;
      return;
    }
    const timer = setTimeout(() => {
      this.timers.delete(timer);
      if (!record.delivered && !this.stopped) this.track(this.attempt(record, retryIndex + 1));
    }, delay);
    this.timers.add(timer);
  }

  private async send(record: EventRecord): Promise<number> {
    const transport = this.options.transport ?? (this.options.webhookUrl ? httpTransport(this.options.timeoutMs ?? 10_000) : undefined);
    if (!transport) return 0;
    const started = Date.now();
    let status = 0;
    let error: string | undefined;
    try {
      status = await transport({
        url: this.options.webhookUrl ?? "",
        body: record.payload,
        headers: {
          "content-type": "application/json; charset=utf-8",
          "stripe-signature": this.sign(record.payload),
          "user-agent": "Bendwise-Payments-Fake/1.0 (webhooks)",
        },
      });
    } catch (e) {
      error = (e as Error).message;
    }
    record.deliveries.push({ attempt: record.deliveries.length + 1, at: started, status, ms: Date.now() - started, ...(error ? { error } : {}) });
    if (status >= 200 && status < 300) {
      record.delivered = true;
      record.event.pending_webhooks = 0;
    }
    return status;
  }
}
