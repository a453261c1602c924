// Types for smtp.mjs.
export declare const DEFAULT_SMTP_PORT: number;
export declare const DEFAULT_SMTP_WEB_PORT: number;
export interface SmtpFake {
  url: string;
  webUrl: string;
  apiUrl: string;
  smtpHost: string;
  smtpPort: number;
  smtpUrl: string;
  directory: string;
  close(): Promise<void>;
}
export declare function startSmtpFake(options?: { port?: number; webPort?: number; dataDir?: string; silent?: boolean }): Promise<SmtpFake>;
