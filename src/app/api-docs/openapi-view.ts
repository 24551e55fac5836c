/**
 * Turns an OpenAPI 3.1 document (as served at /api/openapi.json) into what the reference page
 * shows: operations grouped by tag, with parameters and a flattened view of the JSON body schema.
 * Only the parts of the specification the server emits are modelled.
 */

export interface JsonSchema {
  $ref?: string;
  type?: string | string[];
  properties?: Record<string, JsonSchema>;
  required?: string[];
  items?: JsonSchema;
  enum?: unknown[];
  anyOf?: JsonSchema[];
  oneOf?: JsonSchema[];
  description?: string;
  format?: string;
  minimum?: number;
  maximum?: number;
  exclusiveMinimum?: number;
  minLength?: number;
  maxLength?: number;
  minItems?: number;
  maxItems?: number;
  pattern?: string;
  default?: unknown;
  additionalProperties?: boolean | JsonSchema;
}

export interface OpenApiDocument {
  info: { title: string; version: string; description?: string };
  tags?: { name: string }[];
  paths: Record<string, Record<string, OperationObject>>;
  components?: { schemas?: Record<string, JsonSchema> };
}

interface OperationObject {
  tags?: string[];
  summary?: string;
  description?: string;
  parameters?: { name: string; in: string; required?: boolean; description?: string; schema?: JsonSchema }[];
  requestBody?: { content: Record<string, { schema: JsonSchema }> };
  responses?: Record<string, { description?: string }>;
  'x-access'?: string;
}

export interface FieldRow {
  /** Dotted path, "[]" for array items: "results[].values". */
  path: string;
  depth: number;
  type: string;
  required: boolean;
  rules: string;
  description: string;
}

export interface OperationView {
  id: string;
  method: string;
  path: string;
  summary: string;
  description: string;
  access: string;
  parameters: { name: string; in: string; required: boolean; type: string; description: string }[];
  bodyType: string | null;
  body: FieldRow[];
  responses: { status: string; description: string }[];
}

export interface TagGroup {
  tag: string;
  operations: OperationView[];
}

const METHOD_ORDER = ['get', 'post', 'put', 'patch', 'delete'];
const MAX_DEPTH = 4;

function resolve(doc: OpenApiDocument, schema: JsonSchema): JsonSchema {
  if (!schema.$ref) return schema;
  return doc.components?.schemas?.[schema.$ref.split('/').pop() ?? ''] ?? schema;
}

export function typeOf(doc: OpenApiDocument, raw: JsonSchema): string {
  const schema = resolve(doc, raw);
  if (schema.enum) return schema.enum.map((v) => JSON.stringify(v)).join(' | ');
  const alts = schema.anyOf ?? schema.oneOf;
  if (alts) return alts.map((a) => typeOf(doc, a)).join(' | ');
  if (schema.type === 'array') return `${schema.items ? typeOf(doc, schema.items) : 'any'}[]`;
  if (Array.isArray(schema.type)) return schema.type.join(' | ');
  if (schema.type === 'object' && !schema.properties && schema.additionalProperties && typeof schema.additionalProperties === 'object') return `{ [key]: ${typeOf(doc, schema.additionalProperties)} }`;
  return schema.format ? `${schema.type ?? 'any'} (${schema.format})` : (schema.type ?? 'any');
}

export function rulesOf(schema: JsonSchema): string {
  const r: string[] = [];
  if (schema.minimum !== undefined) r.push(`≥ ${schema.minimum}`);
  if (schema.exclusiveMinimum !== undefined) r.push(`> ${schema.exclusiveMinimum}`);
  if (schema.maximum !== undefined) r.push(`≤ ${schema.maximum}`);
  if (schema.minLength !== undefined) r.push(`at least ${schema.minLength} chars`);
  if (schema.maxLength !== undefined) r.push(`at most ${schema.maxLength} chars`);
  if (schema.minItems !== undefined) r.push(`at least ${schema.minItems} items`);
  if (schema.maxItems !== undefined) r.push(`at most ${schema.maxItems} items`);
  if (schema.pattern) r.push(`pattern ${schema.pattern}`);
  if (schema.default !== undefined) r.push(`default ${JSON.stringify(schema.default)}`);
  return r.join(', ');
}

/** Object properties (and those of array items, and of object alternatives) as indented rows. */
export function flattenSchema(doc: OpenApiDocument, raw: JsonSchema, prefix = '', depth = 0): FieldRow[] {
  const schema = resolve(doc, raw);
  if (depth > MAX_DEPTH) return [];
  if (schema.type === 'array' && schema.items) return flattenSchema(doc, schema.items, prefix ? `${prefix}[]` : '[]', depth);
  const alts = schema.anyOf ?? schema.oneOf;
  if (alts) return alts.flatMap((a) => flattenSchema(doc, a, prefix, depth));
  const rows: FieldRow[] = [];
  for (const [name, child] of Object.entries(schema.properties ?? {})) {
    const resolved = resolve(doc, child);
    const path = prefix ? `${prefix}.${name}` : name;
    rows.push({ path, depth, type: typeOf(doc, child), required: (schema.required ?? []).includes(name), rules: rulesOf(resolved), description: resolved.description ?? '' });
    rows.push(...flattenSchema(doc, resolved, path, depth + 1));
  }
  return rows;
}

export function groupOperations(doc: OpenApiDocument): TagGroup[] {
  const groups = new Map<string, OperationView[]>((doc.tags ?? []).map((t) => [t.name, []]));
  for (const [path, ops] of Object.entries(doc.paths)) {
    for (const method of Object.keys(ops).sort((a, b) => METHOD_ORDER.indexOf(a) - METHOD_ORDER.indexOf(b))) {
      const op = ops[method]!;
      const tag = op.tags?.[0] ?? 'Other';
      const content = op.requestBody?.content ?? {};
      const [bodyType, media] = Object.entries(content)[0] ?? [null, null];
      const view: OperationView = {
        id: `${method}-${path}`.replace(/[^\w-]+/g, '-'),
        method: method.toUpperCase(),
        path,
        summary: op.summary ?? '',
        description: (op.description ?? '').replace(/\n*Access: [^\n]*$/, ''),
        access: op['x-access'] ?? '',
        parameters: (op.parameters ?? []).map((p) => ({ name: p.name, in: p.in, required: p.required === true, type: p.schema ? typeOf(doc, p.schema) : 'string', description: p.description ?? p.schema?.description ?? '' })),
        bodyType,
        body: media ? flattenSchema(doc, media.schema) : [],
        responses: Object.entries(op.responses ?? {}).map(([status, r]) => ({ status, description: r.description ?? '' })),
      };
      if (!groups.has(tag)) groups.set(tag, []);
      groups.get(tag)!.push(view);
    }
  }
  return [...groups].filter(([, ops]) => ops.length > 0).map(([tag, operations]) => ({ tag, operations }));
}

/** Case-insensitive filter on path, summary, method and tag. */
export function filterGroups(groups: readonly TagGroup[], text: string): TagGroup[] {
  const q = text.trim().toLowerCase();
  if (!q) return [...groups];
  return groups
    .map((g) => ({ tag: g.tag, operations: g.tag.toLowerCase().includes(q) ? g.operations : g.operations.filter((o) => `${o.method} ${o.path} ${o.summary}`.toLowerCase().includes(q)) }))
    .filter((g) => g.operations.length > 0);
}
