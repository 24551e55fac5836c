import { OpenAPIRegistry, OpenApiGeneratorV31, type RouteConfig } from '@asteasolutions/zod-to-openapi';
import { z, type ZodType } from 'zod';
import type { Policy } from '../auth/policy.js';
import type { RouteInfo } from '../auth/route-list.js';
import { ANALYSIS_OPERATIONS } from './catalogue-analysis.js';
import { AUTOMATION_OPERATIONS } from './catalogue-automation.js';
import { FOUNDATION_OPERATIONS } from './catalogue-foundation.js';
import { STUDY_OPERATIONS } from './catalogue-studies.js';
import { routeKey, type OperationDoc } from './catalogue.js';

/** Every documented operation; order is the order of the reference page. */
export const CATALOGUE: readonly OperationDoc[] = [...FOUNDATION_OPERATIONS, ...STUDY_OPERATIONS, ...ANALYSIS_OPERATIONS, ...AUTOMATION_OPERATIONS];

const apiError = z
  .object({
    message: z.string().meta({ description: 'What went wrong, naming the offending value' }),
    details: z.array(z.object({ path: z.string(), message: z.string() })).optional(),
    current: z.unknown().optional().meta({ description: 'On 409: the stored state you conflicted with' }),
  })
  .meta({ id: 'ApiError' });

/** Express "/studies/:id/runs/:runId" → OpenAPI "/studies/{id}/runs/{runId}". */
export function toOpenApiPath(path: string): string {
  return path.replace(/:(\w+)/g, '{$1}');
}

/** Who may call a route, in words, from the policy its first handler declares. */
export function describeAccess(policy: Policy | undefined): string {
  if (!policy) return 'undeclared';
  if (policy.kind === 'public') return 'anyone';
  const scope = policy.scope === 'write' ? ' (API token: write scope)' : ' (API token: read or write)';
  if (policy.kind === 'roles') return (policy.roles ? `signed in as ${policy.roles.join(' or ')}` : 'any signed-in user') + scope;
  const roles = policy.roles ? `, account role ${policy.roles.join(' or ')}` : '';
  return `study ${policy.studyRoles.join(' or ')} (admins always)${roles}${scope}`;
}

function pathParams(path: string): z.ZodObject | undefined {
  const names = [...path.matchAll(/:(\w+)/g)].map((m) => m[1]!);
  if (!names.length) return undefined;
  return z.object(Object.fromEntries(names.map((n) => [n, z.string().meta({ description: n === 'id' ? 'Numeric id (the study for /studies routes)' : `Numeric ${n}` })])));
}

function multipartSchema(fields: NonNullable<OperationDoc['multipart']>): ZodType {
  const shape: Record<string, ZodType> = {};
  for (const [name, f] of Object.entries(fields)) {
    const base = f.binary ? z.string().meta({ format: 'binary', description: f.description }) : z.string().meta({ description: f.description });
    shape[name] = f.required ? base : base.optional();
  }
  return z.object(shape);
}

function routeConfig(doc: OperationDoc, policy: Policy | undefined): RouteConfig {
  const headers = doc.headers ? z.object(Object.fromEntries(Object.entries(doc.headers).map(([h, d]) => [h, d.required ? z.string().meta({ description: d.description }) : z.string().optional().meta({ description: d.description })]))) : undefined;
  const errorResponse = (description: string) => ({ description, content: { 'application/json': { schema: apiError } } });
  const status = doc.status ?? 200;
  const success =
    status === 204
      ? { description: 'Done; no body' }
      : doc.contentTypes
        ? { description: doc.responseDescription ?? 'The file', content: Object.fromEntries(doc.contentTypes.map((c) => [c, { schema: c === 'application/json' && doc.response ? doc.response : z.string() }])) }
        : { description: doc.responseDescription ?? 'Success', content: { 'application/json': { schema: doc.response ?? z.object({}).loose() } } };
  const responses: RouteConfig['responses'] = { [status]: success, 400: errorResponse('Invalid input: `details` names each field') };
  if (policy?.kind !== 'public') {
    responses[401] = errorResponse('Not signed in, or the API token is unknown, revoked or expired');
    responses[403] = errorResponse('Your role (or the token\'s scope) does not allow this');
  }
  if (policy?.kind === 'study' || doc.path.includes(':')) responses[404] = errorResponse('Not found (studies you are not a member of are not found either)');
  for (const [code, text] of Object.entries(doc.errors ?? {})) responses[Number(code)] = errorResponse(text);
  return {
    method: doc.method.toLowerCase() as RouteConfig['method'],
    path: toOpenApiPath(doc.path),
    tags: [doc.tag],
    summary: doc.summary,
    description: [doc.description, `Access: ${describeAccess(policy)}.`].filter(Boolean).join('\n\n'),
    security: policy?.kind === 'public' ? [] : [{ session: [] }, { bearerToken: [] }],
    request: {
      params: pathParams(doc.path),
      query: doc.query,
      headers,
      body: doc.body
        ? { required: true, content: { 'application/json': { schema: doc.body } } }
        : doc.multipart
          ? { required: true, content: { 'multipart/form-data': { schema: multipartSchema(doc.multipart) } } }
          : undefined,
    },
    responses,
    'x-access': describeAccess(policy),
  } as RouteConfig;
}

/**
 * The OpenAPI 3.1 document of the routes that exist in `routes` (the live router), described by
 * the catalogue. Routes without a catalogue entry are left out — the test catches them.
 */
export function buildOpenApiDocument(routes: readonly RouteInfo[], version: string): ReturnType<OpenApiGeneratorV31['generateDocument']> {
  const live = new Map(routes.map((r) => [routeKey(r.method, r.path), r]));
  const registry = new OpenAPIRegistry();
  registry.registerComponent('securitySchemes', 'session', { type: 'apiKey', in: 'cookie', name: 'specimetry.sid', description: 'Browser session from POST /auth/login; mutating calls also need the X-XSRF-TOKEN header copied from the XSRF-TOKEN cookie.' });
  registry.registerComponent('securitySchemes', 'bearerToken', { type: 'http', scheme: 'bearer', description: 'Personal access token (spm_…) from your account page. No XSRF header needed.' });
  for (const doc of CATALOGUE) {
    const route = live.get(routeKey(doc.method, doc.path));
    if (route) registry.registerPath(routeConfig(doc, route.policy));
  }
  return new OpenApiGeneratorV31(registry.definitions).generateDocument({
    openapi: '3.1.0',
    info: {
      title: 'Specimetry API',
      version,
      description:
        'Plan, record, analyse and sign off specimen-geometry studies. Every path is under /api. Errors are `ApiError` objects. ' +
        'Statistics inform decisions; they do not replace qualified engineering judgement or the applicable test standards.',
    },
    servers: [{ url: '/api' }],
    tags: [...new Set(CATALOGUE.map((d) => d.tag))].map((name) => ({ name })),
  });
}
