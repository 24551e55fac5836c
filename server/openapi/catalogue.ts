import type { ZodObject, ZodType } from 'zod';

/**
 * What the API reference says about one route, beside the zod schemas the route itself validates
 * with. The document lists exactly the routes of the running router that have an entry here; the
 * test in tests/api/openapi.spec.ts fails for any route without one (add it in the catalogue file
 * of its area) and for any entry whose route no longer exists.
 */
export interface OperationDoc {
  method: 'GET' | 'POST' | 'PUT' | 'PATCH' | 'DELETE';
  /** Express path under /api, e.g. "/studies/:id/runs/:runId". */
  path: string;
  tag: string;
  summary: string;
  description?: string;
  body?: ZodType;
  /** multipart/form-data fields: name → description; `file` fields are binary. */
  multipart?: Record<string, { description: string; binary?: boolean; required?: boolean }>;
  query?: ZodObject;
  /** Extra request headers, e.g. Idempotency-Key. */
  headers?: Record<string, { description: string; required?: boolean }>;
  /** Success status (default 200) and what it carries. */
  status?: number;
  response?: ZodType;
  responseDescription?: string;
  /** Non-JSON success body, e.g. text/csv for downloads. */
  contentTypes?: string[];
  /** Error statuses worth documenting beyond the common 400/401/403/404. */
  errors?: Record<number, string>;
}

export type Method = OperationDoc['method'];

/** Compact constructor: `op('GET /studies/:id', 'Studies', 'Read one study', {...})`. */
export function op(route: `${Method} /${string}`, tag: string, summary: string, rest: Omit<OperationDoc, 'method' | 'path' | 'tag' | 'summary'> = {}): OperationDoc {
  const space = route.indexOf(' ');
  return { method: route.slice(0, space) as Method, path: route.slice(space + 1), tag, summary, ...rest };
}

export const routeKey = (method: string, path: string) => `${method.toUpperCase()} ${path}`;
