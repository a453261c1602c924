// Types for stripe.mjs.
export declare const DEFAULT_STRIPE_PORT: number;
export declare const DEFAULT_WEBHOOK_SECRET: string;
export type VerificationState = "pending" | "verified" | "restricted" | "rejected";
export interface StripeFakeOptions {
  port?: number;
  /** null keeps state in memory only; default <CAIRN_FAKES_DIR>/stripe */
  dataDir?: string | null;
  /** null: only registered endpoints; default env STRIPE_FAKE_WEBHOOK_URL */
  webhookUrl?: string | null;
  webhookSecret?: string;
  initialAccountState?: VerificationState;
  startingBalance?: number;
  defaultCurrency?: string;
  webhookMaxAttempts?: number;
  webhookRetryBaseMs?: number;
  webhookRetryMaxMs?: number;
  webhookTimeoutMs?: number;
  autoDeliver?: boolean;
  holdMs?: number;
  log?: (message: string) => void;
}
export interface StripeFakeHandle {
  url: string;
  port: number;
  host: string;
  dataDir: string | null;
  /** The in-process fake (state, dispatcher); prefer the /_fake HTTP API in tests. */
  fake: unknown;
  close(): Promise<void>;
}
export declare function startStripeFake(options?: StripeFakeOptions): Promise<StripeFakeHandle>;
/** The Stripe-Signature header value for a payload: `t=<seconds>,v1=<hex HMAC-SHA256>`. */
export declare function signatureHeader(payload: string, secret: string, t?: number): string;
