import { checkRecord, coveringRecordSchema } from '../../../rules'

// Checks one covering record against its jurisdiction's rule set; stores nothing.
export default defineEventHandler(async (event) => {
  await requireUser(event)
  const record = await readValidatedBody(event, validateWith(coveringRecordSchema))
  return checkRecord(record)
})
