// A request refused for a reason a person can act on. Services throw these; one error hook
// (server/plugins/unavailable.ts) answers them all in the API's shape: the status, a message that names the
// field, and `data.fields[field]` so a form can mark it. Handlers never catch them to map them by hand.

export class Refusal extends Error {
  override name = 'Refusal'
  /** Per-field messages for `data.fields`; by default the field and the message. */
  readonly fields: Record<string, string>

  // What went wrong underneath (an S3 or SMTP error), for the logs. Not `cause`: h3 would wrap that instead of the Refusal.
  constructor(readonly statusCode: number, readonly field: string | null, message: string, fields?: Record<string, string>, readonly underlying?: unknown) {
    super(message)
    this.fields = fields ?? (field ? { [field]: message } : {})
  }
}

/** 400: the request names something that cannot be; change the field. */
export const invalid = (field: string, message: string) => new Refusal(400, field, message)
/** 404: what the field points at is not there, or not the caller's. */
export const notFound = (field: string, message: string) => new Refusal(404, field, message)
/** 409: the register's present state does not allow it (already closed, already used). */
export const conflict = (field: string, message: string) => new Refusal(409, field, message)
/** 413: the upload is larger than the limit. */
export const tooLarge = (field: string, message: string) => new Refusal(413, field, message)
/** 415: the upload is not a kind Tautline reads. */
export const unsupported = (field: string, message: string) => new Refusal(415, field, message)
/** 503: a service the request needs is unreachable; nothing was done, try again. */
export const unavailable = (message: string) => new Refusal(503, null, message)
