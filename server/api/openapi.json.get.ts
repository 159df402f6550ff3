import { openApiDocument } from '../openapi/document'

/** GET /api/openapi.json — the OpenAPI 3.1 description of every route (public: it holds no data). */
export default defineEventHandler(() => openApiDocument())
