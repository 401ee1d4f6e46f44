import { canOversee } from '#shared/access'
import { stringify } from 'csv-stringify/sync'
import { templateRows } from '#shared/schemas/imports'

// The import template: every column in order and two sample rows (the README documents each column).
export default defineEventHandler(async (event) => {
  await requireRole(event, canOversee)
  setResponseHeaders(event, {
    'Content-Type': 'text/csv; charset=utf-8',
    'Content-Disposition': 'attachment; filename="tautline-import-template.csv"',
  })
  return stringify(templateRows())
})
