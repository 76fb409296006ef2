import { AppError } from "./errors";

export function jsonResponse(body: unknown, init: ResponseInit = {}): Response {
  return Response.json(body, init);
}

/** Turns anything thrown inside a route handler into the API's error shape. */
export function errorResponse(error: unknown): Response {
  if (error instanceof AppError) {
    return Response.json(error.toBody(), { status: error.status, headers: error.headers });
  }
  console.error("Unhandled error in route handler", error);
  const body = new AppError("internal", "Something went wrong on our side. Please try again.").toBody();
  return Response.json(body, { status: 500 });
}

/** Wraps a route handler so every failure answers with the error shape. */
export function handleRoute<A extends unknown[]>(
  handler: (...args: A) => Promise<Response>,
): (...args: A) => Promise<Response> {
  return async (...args: A) => {
    try {
      return await handler(...args);
    } catch (error) {
      return errorResponse(error);
    }
  };
}
