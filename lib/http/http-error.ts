/** An error that carries the HTTP status a route handler answers with. */
export type HttpStatus = 400 | 401 | 403 | 404 | 409 | 413 | 415 | 422 | 429;

export class HttpError extends Error {
  constructor(
    public readonly status: HttpStatus,
    message: string,
    public readonly details?: unknown,
  ) {
    super(message);
    this.name = "HttpError";
  }
}

export const unauthorized = (m = "Sign in to continue.") => new HttpError(401, m);
export const forbidden = (m = "Your role in this team does not allow this.") => new HttpError(403, m);
export const notFound = (what = "This resource") => new HttpError(404, `${what} was not found in your team.`);
