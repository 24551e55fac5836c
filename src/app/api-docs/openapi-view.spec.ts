import { describe, expect, it } from 'vitest';
import { filterGroups, flattenSchema, groupOperations, typeOf, type OpenApiDocument } from './openapi-view';

// Shapes follow the OpenAPI 3.1.0 specification (spec.openapis.org/oas/v3.1.0): paths -> methods ->
// operation objects; $ref into components.schemas; JSON Schema 2020-12 keywords for bodies.
const doc: OpenApiDocument = {
  info: { title: 'T', version: '1' },
  tags: [{ name: 'Run sheet' }, { name: 'Automation' }],
  paths: {
    '/studies/{id}/runs': {
      get: { tags: ['Run sheet'], summary: 'Read the sheet', parameters: [{ name: 'id', in: 'path', required: true, schema: { type: 'string' } }], responses: { '200': { description: 'Success' } } },
    },
    '/studies/{id}/results': {
      post: {
        tags: ['Automation'],
        summary: 'Push results',
        description: 'Idempotent.\n\nAccess: study owner.',
        'x-access': 'study owner',
        requestBody: { content: { 'application/json': { schema: { $ref: '#/components/schemas/Push' } } } },
        responses: { '200': { description: 'Success' }, '422': { description: 'Key reused' } },
      },
    },
  },
  components: {
    schemas: {
      Push: { type: 'object', required: ['results'], properties: { results: { type: 'array', maxItems: 10000, items: { $ref: '#/components/schemas/Item' } } } },
      Item: { type: 'object', properties: { runId: { anyOf: [{ type: 'integer' }, { type: 'string' }] }, outcome: { type: 'string', maxLength: 120 } } },
    },
  },
};

describe('openapi-view', () => {
  it('groups operations by tag in the document\'s tag order, keeping the access note apart', () => {
    const groups = groupOperations(doc);
    expect(groups.map((g) => g.tag)).toEqual(['Run sheet', 'Automation']);
    const push = groups[1]!.operations[0]!;
    expect(push).toMatchObject({ method: 'POST', path: '/studies/{id}/results', description: 'Idempotent.', access: 'study owner', bodyType: 'application/json' });
    expect(push.responses.map((r) => r.status)).toEqual(['200', '422']);
  });

  it('flattens a body schema through $ref and array items, with types and rules', () => {
    const rows = flattenSchema(doc, { $ref: '#/components/schemas/Push' });
    expect(rows.map((r) => r.path)).toEqual(['results', 'results[].runId', 'results[].outcome']);
    expect(rows[0]).toMatchObject({ required: true, type: 'object[]', rules: 'at most 10000 items', depth: 0 });
    expect(rows[1]).toMatchObject({ type: 'integer | string', depth: 1 });
    expect(rows[2]!.rules).toBe('at most 120 chars');
    expect(typeOf(doc, { enum: ['read', 'write'] })).toBe('"read" | "write"');
  });

  it('filters by path, summary, method or tag, case-insensitively', () => {
    const groups = groupOperations(doc);
    expect(filterGroups(groups, 'post').flatMap((g) => g.operations.map((o) => o.path))).toEqual(['/studies/{id}/results']);
    expect(filterGroups(groups, 'RUN SHEET')[0]!.operations).toHaveLength(1);
    expect(filterGroups(groups, 'nothing like this')).toEqual([]);
    expect(filterGroups(groups, '  ')).toHaveLength(2);
  });
});
