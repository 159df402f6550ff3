/**
 * POST /api/labs/:lab/systems/:system/datasets — an editor uploads a CSV of
 * measurements (multipart: "file", optional "name"). A file with mistakes is
 * a 400 whose `data.problems` name each line and column; nothing is stored.
 */
import { SystemParams } from '#shared/utils/lab-schemas'
import { DatasetFields } from '#shared/utils/dataset-schemas'

export default defineEventHandler(async (event) => {
  const params = validateParams(event, SystemParams)
  const { system, user, lab } = await requireSystem(event, params.lab, params.system, 'editor')
  const upload = await readDatasetUpload(event)
  const fields = validateFields(DatasetFields, upload.fields)
  const name = fields.name ?? (upload.filename.replace(/\.(csv|txt)$/i, '').trim() || 'data')
  const sha256 = sha256Hex(upload.source)
  const id = await useDb().transaction(async (tx) => {
    let inserted: { id: number }
    try {
      [inserted] = await tx.insert(tables.datasets).values({
        systemId: system.id, name, filename: upload.filename, columns: upload.data.headers, rows: JSON.stringify(upload.data.rows),
        rowCount: upload.data.rows.length, source: upload.source, sha256, createdBy: user.id,
      }).$returningId() as [{ id: number }]
    } catch (error) {
      if (!isDuplicateKey(error)) throw error
      throw createError({ statusCode: 409, message: `${system.title} already has a data set named "${name}"; choose another name, or delete that one first`, data: { issues: [{ path: 'name', message: 'Already used in this system' }] } })
    }
    await recordAudit(tx, { actorId: user.id, labId: lab.id, action: 'dataset.upload', detail: { slug: system.slug, dataset: inserted.id, name, sha256, rows: upload.data.rows.length } })
    return inserted.id
  })
  const row = await requireDataset(system.id, id)
  setResponseStatus(event, 201)
  return { dataset: datasetSummary(row, user.name) }
})
