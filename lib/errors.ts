// The one typed error of the app. Route handlers turn it into { error: { code, message, fields? } }.
export type ErrorCode =
  | 'bad_request'
  | 'unauthorized'
  | 'forbidden'
  | 'not_found'
  | 'conflict'
  | 'payload_too_large'
  | 'unsupported_media_type'
  | 'invalid_input'
  | 'rate_limited'
  | 'internal';

const STATUS: Record<ErrorCode, number> = {
  bad_request: 400,
  unauthorized: 401,
  forbidden: 403,
  not_found: 404,
  conflict: 409,
  payload_too_large: 413,
  unsupported_media_type: 415,
  invalid_input: 422,
  rate_limited: 429,
  internal: 500,
};

export class AppError extends Error {
  readonly code: ErrorCode;
  readonly status: number;
  readonly fields?: Record<string, string>;

  constructor(code: ErrorCode, message: string, fields?: Record<string, string>) {
    super(message);
    this.name = 'AppError';
    this.code = code;
    this.status = STATUS[code];
    this.fields = fields;
  }
}

export type ErrorBody = { error: { code: ErrorCode; message: string; fields?: Record<string, string> } };

export function errorBody(err: AppError): ErrorBody {
  return { error: { code: err.code, message: err.message, ...(err.fields ? { fields: err.fields } : {}) } };
}

/** Flattens zod-style issues into { 'a.b': 'message' } (first message per field). */
export function fieldsFromIssues(issues: ReadonlyArray<{ path: ReadonlyArray<PropertyKey>; message: string }>): Record<string, string> {
  const fields: Record<string, string> = {};
  for (const issue of issues) {
    const key = issue.path.map(String).join('.') || '_';
    if (!(key in fields)) fields[key] = issue.message;
  }
  return fields;
}
