// Stripe-shaped errors: thrown by handlers, rendered as { error: { type, code, param, message } }.

export class StripeFakeError extends Error {
  /**
   * @param {number} status HTTP status
   * @param {{ type: string, code?: string, param?: string, message: string, decline_code?: string }} body
   */
  constructor(status, body) {
    super(body.message);
    this.status = status;
    this.body = body;
  }

  toJSON() {
    const error = { type: this.body.type, message: this.body.message };
    if (this.body.code) error.code = this.body.code;
    if (this.body.param) error.param = this.body.param;
    if (this.body.decline_code) error.decline_code = this.body.decline_code;
    return { error };
  }
}

export const invalidRequest = (message, param, code) =>
  new StripeFakeError(400, { type: "invalid_request_error", message, param, code });

export const missingParam = (param) =>
  invalidRequest(`Missing required param: ${param}.`, param, "parameter_missing");

export const noSuch = (kind, id, param) =>
  new StripeFakeError(404, {
    type: "invalid_request_error",
    code: "resource_missing",
    param: param ?? "id",
    message: `No such ${kind}: '${id}'`,
  });

export const unknownParam = (param) =>
  invalidRequest(`Received unknown parameter: ${param}`, param, "parameter_unknown");

export const apiError = (message = "An unknown error occurred (injected by the Stripe fake).") =>
  new StripeFakeError(500, { type: "api_error", message });
