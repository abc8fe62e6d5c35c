import { z } from 'zod'
import { entryListQuerySchema } from '#shared/schemas/entries'
import { TOKEN_SCOPE_WORDS, TOKEN_SCOPES } from '#shared/schemas/tokens'
import { v1CreateEntrySchema, v1EvaluateSchema } from '#shared/schemas/v1'
import { ENGINE_VERSION, listKinds } from '#shared/thermo'

const jsonSchema = (schema: z.ZodType) => z.toJSONSchema(schema, { io: 'input', unrepresentable: 'any' })

const errorResponse = (description: string) => ({
  description,
  content: { 'application/json': { schema: { $ref: '#/components/schemas/Error' } } },
})

const idParameter = { name: 'id', in: 'path', required: true, schema: { type: 'string', format: 'uuid' } }
const versionParameter = { name: 'version', in: 'query', required: false, schema: { type: 'integer', minimum: 1 }, description: 'The signed version; the newest signed version when left out.' }

const common = {
  401: errorResponse('No token, an unknown token or a revoked token.'),
  403: errorResponse('The token lacks the scope, or the person it acts for may not do this.'),
  429: errorResponse('Over the rate limit; wait the seconds in Retry-After.'),
}

/** The OpenAPI 3.1 description of the /api/v1 routes (served at /api/v1/openapi.json). */
export function integrationOpenApi(serverUrl: string) {
  const listQuery = jsonSchema(entryListQuerySchema) as { properties: Record<string, object> }
  return {
    openapi: '3.1.0',
    info: {
      title: 'Thermotome integration API',
      version: '1.0.0',
      description: `Bearer-token API for host notebook systems. Each token acts for one person and reaches only what that person may; write and export scopes need that person's consent (they make the token themselves on "My API tokens"; an administrator may issue records:read for someone else). Scopes: ${TOKEN_SCOPES.map(s => `${s} (${TOKEN_SCOPE_WORDS[s]})`).join('; ')}. Calculation engine ${ENGINE_VERSION}; kinds: ${listKinds().map(k => k.kind).join(', ')}.`,
    },
    servers: [{ url: serverUrl }],
    security: [{ bearerToken: [] }],
    components: {
      securitySchemes: { bearerToken: { type: 'http', scheme: 'bearer', description: 'A token issued by an administrator (starts with tmt_).' } },
      schemas: {
        Error: {
          type: 'object',
          properties: {
            statusCode: { type: 'integer' },
            message: { type: 'string', description: 'What went wrong, naming the field ("blocks[1].input.temperature: …").' },
            data: { type: 'object', properties: { issues: { type: 'array', items: { type: 'object', properties: { path: { type: 'string' }, message: { type: 'string' } } } } } },
          },
        },
        CreateEntry: jsonSchema(v1CreateEntrySchema),
        Evaluate: jsonSchema(v1EvaluateSchema),
      },
    },
    paths: {
      '/api/v1/notebooks': {
        get: { summary: 'Notebooks the token\'s person may read', 'x-scope': 'records:read', responses: { 200: { description: '{ notebooks: [{ id, name, description }] }' }, ...common } },
      },
      '/api/v1/notebooks/{id}/entries': {
        get: {
          summary: 'Entries of a notebook, paged', 'x-scope': 'records:read',
          parameters: [idParameter, ...Object.entries(listQuery.properties).map(([name, schema]) => ({ name, in: 'query', required: false, schema }))],
          responses: { 200: { description: '{ entries, total, page, pageSize }' }, 400: errorResponse('A bad query parameter, named.'), 404: errorResponse('No such notebook, or not readable.'), ...common },
        },
        post: {
          summary: 'Create a draft entry with text and calculation blocks', 'x-scope': 'entries:write',
          parameters: [idParameter],
          requestBody: { required: true, content: { 'application/json': { schema: { $ref: '#/components/schemas/CreateEntry' } } } },
          responses: { 201: { description: '{ entry: { id, notebookId, title, state, version, content } }' }, 400: errorResponse('Invalid body or block input, naming the block and field.'), 404: errorResponse('No such notebook.'), ...common },
        },
      },
      '/api/v1/entries/{id}': {
        get: { summary: 'One entry with its editor JSON', 'x-scope': 'records:read', parameters: [idParameter], responses: { 200: { description: '{ entry }' }, 404: errorResponse('No such entry, or not readable.'), ...common } },
      },
      '/api/v1/calculations': {
        post: {
          summary: 'Evaluate one calculation with the engine', 'x-scope': 'records:read',
          requestBody: { required: true, content: { 'application/json': { schema: { $ref: '#/components/schemas/Evaluate' } } } },
          responses: { 200: { description: '{ kind, engineVersion, result, warnings }' }, 400: errorResponse('Invalid input, naming the field.'), ...common },
        },
      },
      '/api/v1/records/{id}/bundle': {
        get: { summary: 'The signed record bundle (canonical record, statements, signatures, public keys)', 'x-scope': 'records:export', parameters: [idParameter, versionParameter], responses: { 200: { description: 'RecordBundle JSON (schema thermotome.bundle/1)' }, 404: errorResponse('No such record or no signed version.'), ...common } },
      },
      '/api/v1/records/{id}/pdf': {
        get: { summary: 'The signed record as PDF', 'x-scope': 'records:export', parameters: [idParameter, versionParameter], responses: { 200: { description: 'application/pdf', content: { 'application/pdf': { schema: { type: 'string', format: 'binary' } } } }, 404: errorResponse('No such record or no signed version.'), ...common } },
      },
    },
  }
}
